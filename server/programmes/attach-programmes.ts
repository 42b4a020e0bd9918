import type { AppContext } from '../app-context.js';
import { BenchInstrumentsRepo } from './bench-instruments-repo.js';
import { StoredBenchInstruments } from './bench-instruments-provider.js';
import { ProgrammeRunner } from './programme-runner.js';

/**
 * Starts the programme runner once the run recorder is up (after attachLive): programmes that
 * were running when the server stopped are marked failed; on close every running programme is
 * aborted, its outputs switched off, and the instruments' ports closed.
 */
export async function attachProgrammes(_server: unknown, ctx: AppContext): Promise<() => Promise<void>> {
  // The instruments come from each bench's stored driver settings unless something else provides them (tests).
  ctx.services.benchInstruments ??= new StoredBenchInstruments(new BenchInstrumentsRepo(ctx.sequelize));
  const runner = new ProgrammeRunner(ctx);
  await runner.failStranded();
  ctx.services.programmeRunner = runner;
  return async () => {
    await runner.close();
    await ctx.services.benchInstruments?.close?.();
    delete ctx.services.programmeRunner;
    delete ctx.services.benchInstruments;
  };
}
