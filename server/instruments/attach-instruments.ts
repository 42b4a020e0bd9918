import type { Server } from 'node:http';
import type { AppContext } from '../app-context.js';
import '../benches/bench-services.js';
import '../runs/runs-services.js';
import { FrameCorrector } from './frame-corrector.js';
import './instruments-services.js';
import { InstrumentsRepo } from './instruments-repo.js';

/**
 * Server attachment (after the bench manager and the live area): applies the meters'
 * calibration to every frame where the bench manager makes it, and freezes the bench's
 * instruments and their calibration state onto each live run when it starts.
 */
export async function attachInstruments(_httpServer: Server, ctx: AppContext): Promise<() => Promise<void>> {
  const repo = new InstrumentsRepo(ctx.sequelize);
  const corrector = new FrameCorrector();
  const reload = async () => corrector.load(await repo.list());
  await reload();
  ctx.services.instruments = { corrector, reload };
  const manager = ctx.services.benchManager;
  manager?.setFrameTransform((benchId, frame) => corrector.apply(benchId, frame));
  const recorded = new Set<number>();
  const stopWatching = ctx.services.runRecorder?.runChanges.add((run) => {
    if (run.origin !== 'live' || run.benchId === null || recorded.has(run.id)) return;
    recorded.add(run.id);
    // Once per run: a resumed run keeps the snapshot taken when it started (INSERT IGNORE).
    repo.recordRun(run.id, run.benchId).catch((err: unknown) => ctx.log.error(`run ${run.id}: could not record its instruments`, err));
  });
  return async () => {
    stopWatching?.();
    manager?.setFrameTransform((_benchId, frame) => frame);
    delete ctx.services.instruments;
  };
}
