import type { AppContext } from '../app-context.js';
import { UnavailableError } from '../domain/domain-errors.js';
import type { RunRecorder } from './run-recorder.js';

declare module '../app-context.js' {
  interface AppServices {
    /** Records live runs; set by the composition root (attachRecording) once the server listens. */
    runRecorder: RunRecorder;
  }
}

/** The run recorder, or an UnavailableError when the server runs without live recording. */
export function recorderOf(ctx: AppContext): RunRecorder {
  const recorder = ctx.services.runRecorder;
  if (!recorder) throw new UnavailableError('Live recording is not running on this server');
  return recorder;
}
