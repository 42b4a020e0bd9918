import type { AppContext } from '../app-context.js';
import { HttpError } from '../http/http-error.js';
import type { RunRecorder } from './run-recorder.js';

declare module '../app-context.js' {
  interface AppServices {
    /** Records live runs; set by the composition root (attachRecording) once the server listens. */
    runRecorder: RunRecorder;
  }
}

/** The run recorder, or 503 when the server runs without the live attachment. */
export function recorderOf(ctx: AppContext): RunRecorder {
  const recorder = ctx.services.runRecorder;
  if (!recorder) throw new HttpError(503, 'Live recording is not running on this server');
  return recorder;
}
