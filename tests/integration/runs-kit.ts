import { frameProblem } from '../../shared/schemas/frame-check.js';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import WebSocket from 'ws';
import type { BenchStatus } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { ServerMessageSchema, type ServerMessage } from '../../shared/schemas/ws.js';
import type { FrameFeed } from '../../server/runs/run-recorder.js';
import { csrfAgent, TEST_PASSWORD, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';

/** A frame feed the test drives by hand (stands in for the bench manager). */
export class ManualFeed implements FrameFeed {
  private frames = new Set<(benchId: number, frame: Frame) => void>();
  private statuses = new Set<(benchId: number, status: BenchStatus) => void>();
  onFrame(l: (benchId: number, frame: Frame) => void) {
    this.frames.add(l);
    return () => void this.frames.delete(l);
  }
  onStatus(l: (benchId: number, status: BenchStatus) => void) {
    this.statuses.add(l);
    return () => void this.statuses.delete(l);
  }
  /** Hands a frame on as a source does: only if it passes the check every source makes (frameProblem). */
  emit(benchId: number, frame: Frame): void {
    if (frameProblem(frame) !== null) return;
    for (const l of this.frames) l(benchId, frame);
  }
  status(benchId: number, status: BenchStatus): void {
    for (const l of this.statuses) l(benchId, status);
  }
}

/** A fresh spill folder under the OS temp dir. */
export const tempSpillDir = () => mkdtempSync(join(tmpdir(), 'kp-spill-'));

/** The session cookie of a role, for a WebSocket upgrade. */
export async function sessionCookie(t: { url: string }, role: keyof typeof TEST_USERS): Promise<string> {
  const agent = await csrfAgent(t);
  const login = await agent.post('/api/auth/login').send({ email: TEST_USERS[role].email, password: TEST_PASSWORD }).expect(200);
  const cookie = ([] as string[]).concat(login.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]!).find((c) => c.startsWith('kneepoint.sid='));
  if (!cookie) throw new Error('no session cookie');
  return cookie;
}

/** A WebSocket client that records every message; `next(pred)` waits for one. */
export class WsProbe {
  readonly messages: ServerMessage[] = [];
  /** Messages that did not match the shared ServerMessage schema (should stay empty). */
  readonly invalid: { message: unknown; issue: string }[] = [];
  private waiters: { pred: (m: ServerMessage) => boolean; resolve: (m: ServerMessage) => void }[] = [];
  constructor(readonly ws: WebSocket) {
    ws.on('message', (data) => {
      const raw: unknown = JSON.parse(String(data));
      const checked = ServerMessageSchema.safeParse(raw);
      if (!checked.success) this.invalid.push({ message: raw, issue: checked.error.issues[0]?.message ?? '?' });
      const m = raw as ServerMessage;
      this.messages.push(m);
      this.waiters = this.waiters.filter((w) => (w.pred(m) ? (w.resolve(m), false) : true));
    });
  }
  static open(t: TestContext | { url: string }, cookie?: string): Promise<WsProbe> {
    const url = t.url.replace(/^http/, 'ws') + '/ws';
    const ws = new WebSocket(url, { headers: { origin: t.url, ...(cookie ? { cookie } : {}) } });
    return new Promise((resolve, reject) => {
      ws.once('open', () => resolve(new WsProbe(ws)));
      ws.once('unexpected-response', (_req, res) => reject(new Error(`refused: ${res.statusCode}`)));
      ws.once('error', reject);
    });
  }
  next<T extends ServerMessage['type']>(type: T, pred: (m: Extract<ServerMessage, { type: T }>) => boolean = () => true, timeoutMs = 10_000): Promise<Extract<ServerMessage, { type: T }>> {
    const match = (m: ServerMessage) => m.type === type && pred(m as Extract<ServerMessage, { type: T }>);
    const found = this.messages.find(match);
    if (found) return Promise.resolve(found as Extract<ServerMessage, { type: T }>);
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no ${type} message within ${timeoutMs} ms`)), timeoutMs);
      this.waiters.push({ pred: match, resolve: (m) => (clearTimeout(timer), resolve(m as Extract<ServerMessage, { type: T }>)) });
    });
  }
  send(msg: unknown): void {
    this.ws.send(JSON.stringify(msg));
  }
  close(): void {
    this.ws.terminate();
  }
}

/** Creates a battery and a bench without a source; returns their ids. */
export async function batteryAndBench(admin: SignedInAgent, battery: Record<string, unknown> = {}): Promise<{ batteryId: number; benchId: number }> {
  const b = await admin
    .post('/api/batteries')
    .send({ label: 'Pack A-12', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10, ...battery })
    .expect(201);
  const bench = await admin.post('/api/benches').send({ name: `Bench ${Math.random().toString(36).slice(2, 7)}`, source: { kind: 'none' } }).expect(201);
  return { batteryId: b.body.battery.id as number, benchId: bench.body.bench.id as number };
}

/** Waits until `check` passes (polling), for effects that land asynchronously in the database. */
export async function eventually<T>(check: () => Promise<T>, timeoutMs = 15_000, everyMs = 100): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    try {
      return await check();
    } catch (err) {
      if (Date.now() > until) throw err;
      await new Promise((r) => setTimeout(r, everyMs));
    }
  }
}
