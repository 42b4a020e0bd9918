import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import WebSocket from 'ws';
import type { SessionUser } from '../auth/session-user.js';
import { LiveHub } from './live-hub.js';
import { attachWsServer } from './ws-server.js';

const viewer: SessionUser = { id: 4, email: 'v@lab', name: 'V', role: 'viewer', disabled: false };
const cleanups: (() => Promise<void>)[] = [];
afterEach(async () => {
  for (const c of cleanups.splice(0).reverse()) await c();
});

async function serve(heartbeatMs: number): Promise<string> {
  const server: Server = createServer((_req, res) => res.end());
  const hub = new LiveHub({ source: { benchStatus: () => null, run: async () => null } });
  // The authenticator stands in for the session middleware: a header decides.
  const ws = attachWsServer(server, { hub, heartbeatMs, authenticate: async (req) => (req.headers['x-test-user'] ? viewer : null) });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  cleanups.push(async () => {
    await ws.close();
    await new Promise<void>((r) => server.close(() => r()));
  });
  return `ws://127.0.0.1:${(server.address() as AddressInfo).port}/ws`;
}

describe('attachWsServer', () => {
  it('refuses an upgrade the authenticator rejects, before any socket opens', async () => {
    const url = await serve(1000);
    const ws = new WebSocket(url);
    const status = await new Promise<number>((resolve) => ws.once('unexpected-response', (_q, res) => resolve(res.statusCode ?? 0)));
    expect(status).toBe(401);
  });

  it('terminates a socket that stops answering heartbeats, and keeps one that answers', async () => {
    const url = await serve(50);
    const silent = new WebSocket(url, { headers: { 'x-test-user': '1' }, autoPong: false });
    const polite = new WebSocket(url, { headers: { 'x-test-user': '1' } });
    const hello = await new Promise<{ type: string }>((resolve) => silent.once('message', (d) => resolve(JSON.parse(String(d)))));
    expect(hello).toMatchObject({ type: 'hello' });
    const closedAt = await new Promise<number>((resolve) => silent.once('close', () => resolve(Date.now())));
    expect(closedAt).toBeGreaterThan(0);
    expect(polite.readyState).toBe(WebSocket.OPEN);
    polite.terminate();
  });

  it('terminates a socket that sends unsolicited pongs but never answers a ping', async () => {
    const url = await serve(50);
    const liar = new WebSocket(url, { headers: { 'x-test-user': '1' }, autoPong: false });
    await new Promise((resolve) => liar.once('open', resolve));
    // Pongs with a made-up payload, far more often than the heartbeat pings.
    const flood = setInterval(() => liar.readyState === WebSocket.OPEN && liar.pong(Buffer.from('alive')), 5);
    const closed = await new Promise<boolean>((resolve) => {
      const timer = setTimeout(() => resolve(false), 2000);
      liar.once('close', () => (clearTimeout(timer), resolve(true)));
    });
    clearInterval(flood);
    expect(closed).toBe(true);
  });
});
