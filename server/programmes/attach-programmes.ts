import type { AppContext } from '../app-context.js';
import { ProgrammeRunner } from './programme-runner.js';

/**
 * Starts the programme runner once the run recorder is up (after attachLive): programmes that
 * were running when the server stopped are marked failed; on close every running programme is
 * aborted, its outputs switched off.
 */
export async function attachProgrammes(_server: unknown, ctx: AppContext): Promise<() => Promise<void>> {
  const runner = new ProgrammeRunner(ctx);
  await runner.failStranded();
  ctx.services.programmeRunner = runner;
  return async () => {
    await runner.close();
    delete ctx.services.programmeRunner;
  };
}
