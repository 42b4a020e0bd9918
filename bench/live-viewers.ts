/**
 * The live benchmark's viewers, in a child process of their own (forked by
 * bench/live.bench.ts) so the server process's memory and CPU figures are the server's
 * alone. Opens VIEWERS WebSockets, subscribes each to every bench, and measures the delay
 * from a frame being handed to the hub (its `t` carries the send time, in ms since a shared
 * epoch on the wall clock) to the batch holding it being parsed here.
 */
import WebSocket from 'ws';
import { timeColumn, type ServerMessage } from '../shared/schemas/ws.js';
import { DelayHistogram, wallMs } from './delay-histogram.js';

/** Parent → child. */
export type ToViewers =
  | { type: 'start'; url: string; cookie: string; viewers: number; benches: number; epochMs: number }
  | { type: 'measure'; on: boolean }
  | { type: 'report' };
/** Child → parent. */
export type FromViewers =
  | { type: 'ready' }
  | { type: 'report'; received: number; p50Ms: number; p99Ms: number; maxMs: number; rssStartMB: number; rssMB: number; heapMB: number };

/** The viewers' delays stay well under this on a loopback socket; a longer one counts as this long (its maximum is kept). */
const DELAY_RANGE_MS = 10_000;
const mb = (b: number) => +(b / 1e6).toFixed(1);

async function main(): Promise<void> {
  const delays = new DelayHistogram(DELAY_RANGE_MS);
  const sockets: WebSocket[] = [];
  let measuring = false;
  let received = 0;
  let rssStartMB = 0;
  process.on('message', async (m: ToViewers) => {
    if (m.type === 'measure') {
      measuring = m.on;
      if (m.on) rssStartMB = mb(process.memoryUsage().rss);
    }
    else if (m.type === 'report') {
      const mem = process.memoryUsage();
      const r: FromViewers = { type: 'report', received, p50Ms: delays.quantile(0.5), p99Ms: delays.quantile(0.99), maxMs: delays.max, rssStartMB, rssMB: mb(mem.rss), heapMB: mb(mem.heapUsed) };
      process.send!(r);
      for (const s of sockets) s.terminate();
      process.disconnect();
    } else if (m.type === 'start') {
      for (let v = 0; v < m.viewers; v++) {
        const ws = new WebSocket(m.url.replace('http', 'ws') + '/ws', { headers: { cookie: m.cookie, origin: m.url } });
        await new Promise((resolve, reject) => (ws.once('open', resolve), ws.once('error', reject)));
        ws.on('message', (data) => {
          const now = wallMs() - m.epochMs;
          const msg = JSON.parse(String(data)) as ServerMessage;
          if (msg.type !== 'batch') return;
          for (const t of timeColumn(msg.readings)) {
            received++;
            if (measuring) delays.add(now - t * 1000);
          }
        });
        for (let b = 1; b <= m.benches; b++) ws.send(JSON.stringify({ type: 'subscribe', topic: { kind: 'bench', id: b } }));
        sockets.push(ws);
      }
      process.send!({ type: 'ready' } satisfies FromViewers);
    }
  });
}

void main();
