/**
 * A hostile WebSocket viewer, run as its own process by the ws-* fault tests (so its memory
 * is not the server's): it signs in with the cookie it is given, stops reading at once, and
 * then sends what it is told while never reading a byte of the answers.
 *
 *   node --import tsx ws-hostile-client.ts   (env: WS_URL, WS_COOKIE, WS_ORIGIN, WS_PLAN)
 *
 * WS_PLAN is JSON: { pairs, topic, pingEveryMs?, pings? }: `pairs` subscribe/unsubscribe
 * pairs sent as fast as the socket takes them, then `pings` pings every `pingEveryMs`.
 * Messages to the parent: { type: 'open' }, { type: 'sent', count }, and on close
 * { type: 'closed', code, reason }. The parent sends { type: 'resume' } to start reading
 * again (to learn the close code the server queued).
 */
import type { Socket } from 'node:net';
import WebSocket from 'ws';

interface Plan {
  pairs: number;
  topic: { kind: 'bench' | 'run'; id: number };
  pings?: number;
  pingEveryMs?: number;
}

const send = (message: Record<string, unknown>) => process.send?.(message);
const plan = JSON.parse(process.env.WS_PLAN ?? '{}') as Plan;
const ws = new WebSocket(process.env.WS_URL!, { headers: { cookie: process.env.WS_COOKIE!, origin: process.env.WS_ORIGIN! } });

ws.once('open', () => {
  const raw = (ws as unknown as { _socket: Socket })._socket;
  raw.pause();
  send({ type: 'open' });
  let count = 0;
  for (let i = 0; i < plan.pairs; i++) {
    ws.send(JSON.stringify({ type: 'subscribe', topic: plan.topic }));
    ws.send(JSON.stringify({ type: 'unsubscribe', topic: plan.topic }));
    count += 2;
  }
  let pings = plan.pings ?? 0;
  const timer = setInterval(() => {
    if (pings-- <= 0 || ws.readyState !== WebSocket.OPEN) {
      clearInterval(timer);
      send({ type: 'sent', count });
      return;
    }
    ws.send(JSON.stringify({ type: 'subscribe', topic: plan.topic }));
    ws.send(JSON.stringify({ type: 'ping' }));
    count += 2;
  }, plan.pingEveryMs ?? 10);
  process.on('message', (m: { type?: string }) => {
    if (m.type === 'resume') raw.resume();
  });
});
ws.on('close', (code, reason) => {
  send({ type: 'closed', code, reason: String(reason) });
  setTimeout(() => process.exit(0), 50);
});
ws.on('error', (error) => send({ type: 'error', message: error.message }));
