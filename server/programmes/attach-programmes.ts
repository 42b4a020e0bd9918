import type { AppContext } from '../app-context.js';
import { SIMULATED_INSTRUMENTS_STARTING } from '../ingest/sources/simulator-source.js';
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
  // A simulated bench that (re)starts its load and supply makes new pseudo-terminals: the ports
  // held open on the old ones are dead, so they are closed and the next programme opens them again.
  const benchInstruments = ctx.services.benchInstruments;
  const offStatus = ctx.services.benchManager?.onStatus((benchId, status) => {
    if (status.state === 'connected' && status.message?.startsWith(SIMULATED_INSTRUMENTS_STARTING)) void benchInstruments.forget?.(benchId);
  });
  return async () => {
    offStatus?.();
    await runner.close();
    await ctx.services.benchInstruments?.close?.();
    delete ctx.services.programmeRunner;
    delete ctx.services.benchInstruments;
  };
}
