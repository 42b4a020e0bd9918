import type { Server } from 'node:http';
import type { AppContext } from '../app-context.js';
import { storedBenches } from '../benches/bench-service.js';
import '../benches/bench-services.js';
import { BenchManager, type ManagedBench } from '../ingest/bench-manager.js';
import { systemClock } from '../ingest/clock.js';
import type { SourceDeps } from '../ingest/sources/create-source.js';
import type { SourceSink } from '../ingest/sources/source.js';
import '../mqtt/attach-mqtt.js';
import { GatewaySource } from '../mqtt/gateway-source.js';
import { createLogger } from '../log/logger.js';

/**
 * The composition root of the benches: builds the bench manager (one source per stored
 * bench, framed and parsed into frames), gives the benches a gateway runs a stand-in fed
 * over MQTT, publishes it as `ctx.services.benchManager` (the recording root takes its
 * frames to the recorder and the live hub), and stops every source on close. A bench whose
 * port is missing does not stop the server: it just reconnects. Runs after the MQTT
 * attachment (its gateway link) and before the recording root.
 */
export async function attachBenchManager(_httpServer: Server, ctx: AppContext, deps: SourceDeps = {}): Promise<() => Promise<void>> {
  const link = ctx.services.gatewayLink;
  // Without MQTT a gateway's bench stays idle.
  const remote = link ? (bench: ManagedBench, sink: SourceSink) => new GatewaySource(bench, sink, link, deps.clock ?? systemClock) : undefined;
  const manager = new BenchManager(deps, createLogger('benches', ctx.log), remote);
  ctx.services.benchManager = manager;
  const benches = await storedBenches(ctx.sequelize);
  await manager.sync(benches);
  ctx.log.info(`Bench manager started ${benches.length} bench(es)`);
  return async () => {
    await manager.stopAll();
    delete ctx.services.benchManager;
  };
}
