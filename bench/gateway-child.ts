/**
 * One bench gateway of the gateways benchmark, in a process of its own (forked by
 * bench/gateways.bench.ts), running the production GatewayRuntime. It tells the parent when
 * each bench's first frame was made (the simulator then makes frame t at that time plus
 * t / speed, so the viewers can tell each frame's age) and, at the end, how many frames it made.
 */
import { GatewayRuntime } from '../server/gateway/gateway-runtime.js';
import { wallMs } from './delay-histogram.js';
import { quietLogger } from '../server/log/logger.js';

/** Parent → child. */
export type ToGateway = { type: 'start'; brokerUrl: string; name: string; password: string; dir: string } | { type: 'stop' };
/** Child → parent. */
export type FromGateway =
  | { type: 'epoch'; benchId: number; atMs: number }
  | { type: 'state'; framesMade: number; outboxDepth: number }
  | { type: 'stopped'; framesMade: number; outboxDepth: number; cpuPercentOfOneCore: number };

let gateway: GatewayRuntime | undefined;
let framesMade = 0;
let startedAt = { cpu: process.cpuUsage(), wallMs: Date.now() };
let producing = true;
const STATE_EVERY_MS = 1000;
const DRAIN_MS = 60_000;

process.on('message', async (m: ToGateway) => {
  if (m.type === 'start') {
    gateway = new GatewayRuntime({ brokerUrl: m.brokerUrl, name: m.name, password: m.password, dir: m.dir, log: quietLogger });
    gateway.onFrame((benchId, frame) => {
      if (!producing) return;
      framesMade++;
      if (frame.t === 0) process.send!({ type: 'epoch', benchId, atMs: wallMs() } satisfies FromGateway);
    });
    await gateway.start();
    startedAt = { cpu: process.cpuUsage(), wallMs: Date.now() };
    setInterval(() => process.send!({ type: 'state', framesMade, outboxDepth: gateway!.outboxDepth } satisfies FromGateway), STATE_EVERY_MS).unref();
  } else if (m.type === 'stop') {
    const g = gateway!;
    const cpu = process.cpuUsage(startedAt.cpu);
    const cpuPercentOfOneCore = +(((cpu.user + cpu.system) / 1000 / (Date.now() - startedAt.wallMs)) * 100).toFixed(1);
    // The sources stop first, then the outbox drains (the parent checks that nothing was lost).
    await g.stop(DRAIN_MS);
    producing = false;
    process.send!({ type: 'stopped', framesMade, outboxDepth: g.outboxDepth, cpuPercentOfOneCore } satisfies FromGateway);
    process.disconnect();
  }
});
