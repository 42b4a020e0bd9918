/**
 * The viewer of the gateways benchmark, in a process of its own (forked by
 * bench/gateways.bench.ts): WebSockets subscribed to every bench, 50 benches each. A frame with source time
 * t on bench b was made at epoch(b) + t / speed (the simulator's schedule, told by the
 * gateways), so its age on arrival here is the whole path: gateway outbox, broker, server
 * link, hub, socket.
 */
import WebSocket from 'ws';
import { timeColumn, type ServerMessage } from '../shared/schemas/ws.js';
import { DelayHistogram, wallMs } from './delay-histogram.js';
import { MS_PER_S } from '../shared/units/time.js';

/** Parent → child. */
export type ToGatewayViewers =
  | { type: 'start'; url: string; cookie: string; benchIds: number[]; speed: number }
  | { type: 'epoch'; benchId: number; atMs: number }
  | { type: 'measure'; on: boolean }
  | { type: 'report' };
/** Child → parent. */
export type FromGatewayViewers =
  | { type: 'ready' }
  | { type: 'report'; received: number; measured: number; p50Ms: number; p99Ms: number; maxMs: number; dropped: number };

const delays = new DelayHistogram();
const epochs = new Map<number, number>();
const sockets: WebSocket[] = [];
/** The hub lets one connection follow 64 topics: one socket per 50 benches, as a board per room would. */
const BENCHES_PER_SOCKET = 50;
let measuring = false;
let received = 0;
let dropped = 0;
let speed = 1;
let lastMessageMs = Date.now();
const QUIET_MS = 2000;
const QUIET_WAIT_MAX_MS = 60_000;

function onMessage(data: string): void {
  const now = wallMs();
  lastMessageMs = Date.now();
  const msg = JSON.parse(data) as ServerMessage;
  if (msg.type !== 'batch' || msg.topic.kind !== 'bench') return;
  dropped += msg.dropped;
  const epoch = epochs.get(msg.topic.id);
  for (const t of timeColumn(msg.readings)) {
    received++;
    if (measuring && epoch !== undefined) delays.add(now - (epoch + (t * MS_PER_S) / speed));
  }
}

process.on('message', async (m: ToGatewayViewers) => {
  if (m.type === 'epoch') epochs.set(m.benchId, m.atMs);
  else if (m.type === 'measure') measuring = m.on;
  else if (m.type === 'report') {
    // Take what the socket still holds before answering: a slow viewer must not read as lost readings.
    const until = Date.now() + QUIET_WAIT_MAX_MS;
    while (Date.now() - lastMessageMs < QUIET_MS && Date.now() < until) await new Promise((r) => setTimeout(r, QUIET_MS / 4));
    const r: FromGatewayViewers = { type: 'report', received, measured: delays.n, p50Ms: delays.quantile(0.5), p99Ms: delays.quantile(0.99), maxMs: delays.max, dropped };
    process.send!(r);
    for (const s of sockets) s.terminate();
    process.disconnect();
  } else if (m.type === 'start') {
    speed = m.speed;
    for (let i = 0; i < m.benchIds.length; i += BENCHES_PER_SOCKET) {
      const ws = new WebSocket(m.url.replace('http', 'ws') + '/ws', { headers: { cookie: m.cookie, origin: m.url } });
      await new Promise((resolve, reject) => (ws.once('open', resolve), ws.once('error', reject)));
      sockets.push(ws);
      ws.on('message', (data) => onMessage(String(data)));
      for (const id of m.benchIds.slice(i, i + BENCHES_PER_SOCKET)) ws.send(JSON.stringify({ type: 'subscribe', topic: { kind: 'bench', id } }));
    }
    process.send!({ type: 'ready' } satisfies FromGatewayViewers);
  }
});
