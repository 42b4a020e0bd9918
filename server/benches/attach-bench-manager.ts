import type { Server } from 'node:http';
import type { AppContext } from '../app-context.js';
import { BenchManager, type ManagedBench } from '../ingest/bench-manager.js';
import { systemClock } from '../ingest/clock.js';
import type { SourceSink } from '../ingest/sources/source.js';
import { GatewaySource } from '../mqtt/gateway-source.js';
import '../mqtt/attach-mqtt.js';
import type { SourceDeps } from '../ingest/sources/create-source.js';
import './bench-services.js';
import { benchModel } from './bench-model.js';
import { createLogger } from '../log/logger.js';
import { toManaged } from './bench-service.js';

/**
 * Server attachment: creates the bench manager, publishes it as `ctx.services.benchManager`
 * (the live area subscribes to its frames), starts every stored bench, and stops them all
 * on close. A bench whose port is missing does not stop the server: it just reconnects.
 */
export async function attachBenchManager(_httpServer: Server, ctx: AppContext, deps: SourceDeps = {}): Promise<() => Promise<void>> {
  const link = ctx.services.gatewayLink;
  // A bench a gateway runs gets a stand-in fed over MQTT (the MQTT attachment ran first); without MQTT it stays idle.
  const remote = link ? (bench: ManagedBench, sink: SourceSink) => new GatewaySource(bench, sink, link, deps.clock ?? systemClock) : undefined;
  const manager = new BenchManager(deps, createLogger('benches', ctx.log), remote);
  ctx.services.benchManager = manager;
  const rows = await benchModel(ctx.sequelize).findAll();
  await manager.sync(rows.map(toManaged));
  ctx.log.info(`Bench manager started ${rows.length} bench(es)`);
  return async () => {
    await manager.stopAll();
    delete ctx.services.benchManager;
  };
}
