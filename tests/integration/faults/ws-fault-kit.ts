import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import type { Frame } from '../../../shared/schemas/frame.js';
import type { TestContext } from '../helpers/index.js';
import type { SignedInAgent } from '../helpers/index.js';
import type { ManualFeed, WsProbe } from '../runs-kit.js';

const CLIENT_SCRIPT = fileURLToPath(new URL('./ws-hostile-client.ts', import.meta.url));

/** What the hostile client process reports. */
export type HostileMessage =
  | { type: 'open' }
  | { type: 'sent'; count: number }
  | { type: 'closed'; code: number; reason: string }
  | { type: 'error'; message: string };

/** A hostile viewer in its own process (ws-hostile-client.ts). */
export interface HostileClient {
  messages: HostileMessage[];
  next<T extends HostileMessage['type']>(type: T, timeoutMs: number): Promise<Extract<HostileMessage, { type: T }>>;
  /** Starts reading again, to learn the close code the server queued. */
  resume(): void;
  kill(): void;
}

/** Starts a hostile viewer process with the session `cookie`, following `plan` (see ws-hostile-client.ts). */
export function startHostileClient(t: TestContext, cookie: string, plan: Record<string, unknown>): HostileClient {
  const child: ChildProcess = fork(CLIENT_SCRIPT, [], {
    execArgv: ['--import', 'tsx'],
    env: { ...process.env, WS_URL: t.url.replace(/^http/, 'ws') + '/ws', WS_COOKIE: cookie, WS_ORIGIN: t.url, WS_PLAN: JSON.stringify(plan) },
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const messages: HostileMessage[] = [];
  const waiters = new Set<() => void>();
  child.on('message', (m) => {
    messages.push(m as HostileMessage);
    for (const w of waiters) w();
  });
  return {
    messages,
    next: (type, timeoutMs) =>
      new Promise((resolve, reject) => {
        const check = () => {
          const found = messages.find((m) => m.type === type);
          if (!found) return false;
          waiters.delete(check);
          clearTimeout(timer);
          resolve(found as never);
          return true;
        };
        const timer = setTimeout(() => {
          waiters.delete(check);
          reject(new Error(`hostile client: no ${type} within ${timeoutMs} ms (got ${messages.map((m) => m.type).join(', ') || 'nothing'})`));
        }, timeoutMs);
        if (!check()) waiters.add(check);
      }),
    resume: () => child.send({ type: 'resume' }),
    kill: () => {
      if (child.exitCode === null) child.kill('SIGKILL');
    },
  };
}

/** The value at quantile `q` (0..1) of `values`. */
export function quantile(values: readonly number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? Number.NaN;
}

/** What the well-behaved side saw while a hostile client did its worst. */
export interface Observation {
  /** Latencies of GET /api/auth/me by another user, ms. */
  meMs: number[];
  /** Round trips of a ping from a reading viewer, ms. */
  pongMs: number[];
  /** Highest resident set size of this process (the server) minus the one at the start, bytes. */
  rssGrowthBytes: number;
  stop(): Promise<void>;
}

const PROBE_EVERY_MS = 100;

/**
 * Keeps asking /api/auth/me as `agent`, pinging through `viewer`, feeding `benchId` readings
 * at `framesPerTick` every tick, and sampling RSS, until stop().
 */
export function observe(agent: SignedInAgent, viewer: WsProbe, feed: ManualFeed, benchId: number, framesPerTick: number): Observation {
  const rssStart = process.memoryUsage().rss;
  const obs: Observation = { meMs: [], pongMs: [], rssGrowthBytes: 0, stop: async () => undefined };
  let running = true;
  let t = 1000;
  let pingId = 0;
  const frame = (): Frame => ({ t: (t += 0.01), volts: 13.1, amps: 4.2, temps: { cell: 25.5 }, clock: 'device' });
  const loop = async () => {
    while (running) {
      for (let i = 0; i < framesPerTick; i++) feed.emit(benchId, frame());
      obs.rssGrowthBytes = Math.max(obs.rssGrowthBytes, process.memoryUsage().rss - rssStart);
      const started = performance.now();
      const id = ++pingId;
      const pong = viewer.next('pong', (m) => m.id === id, 30_000).then(() => obs.pongMs.push(performance.now() - started));
      viewer.send({ type: 'ping', id });
      await agent.get('/api/auth/me').expect(200);
      obs.meMs.push(performance.now() - started);
      await pong;
      await new Promise((r) => setTimeout(r, PROBE_EVERY_MS));
    }
  };
  const done = loop();
  obs.stop = async () => {
    running = false;
    await done;
  };
  return obs;
}
