import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { timeColumn } from '../../shared/schemas/ws.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, ManualFeed, sessionCookie, tempSpillDir, WsProbe } from './runs-kit.js';

const feed = new ManualFeed();
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let ids: { batteryId: number; benchId: number };
const probes: WsProbe[] = [];

beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() })] });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  ids = await batteryAndBench(await signInAs(t, 'admin'));
});
afterAll(async () => {
  // Every message any probe received matched the shared schema the client validates with.
  expect(probes.flatMap((p) => p.invalid)).toEqual([]);
  for (const p of probes) p.close();
  await t?.close();
});

const open = async (cookie?: string) => {
  const p = await WsProbe.open(t, cookie);
  probes.push(p);
  return p;
};

describe('WebSocket /ws', () => {
  it('refuses an upgrade without a session (401) and one from another origin (403)', async () => {
    await expect(WsProbe.open(t)).rejects.toThrow('refused: 401');
    await expect(WsProbe.open({ url: t.url }, 'kneepoint.sid=s%3Aforged.sig')).rejects.toThrow('refused: 401');
    const cookie = await sessionCookie(t, 'viewer');
    const WebSocket = (await import('ws')).default;
    const ws = new WebSocket(t.url.replace('http', 'ws') + '/ws', { headers: { cookie, origin: 'http://elsewhere.example' } });
    const status = await new Promise<number>((resolve) => ws.once('unexpected-response', (_q, res) => resolve(res.statusCode ?? 0)));
    expect(status).toBe(403);
  });

  it('answers an upgrade to any other path with 404 at once instead of leaving the socket open', async () => {
    const cookie = await sessionCookie(t, 'viewer');
    const WebSocket = (await import('ws')).default;
    const ws = new WebSocket(t.url.replace('http', 'ws') + '/wsx', { headers: { cookie, origin: t.url } });
    const status = await new Promise<number | string>((resolve) => {
      const timer = setTimeout(() => resolve('no answer'), 3000);
      ws.once('unexpected-response', (_q, res) => (clearTimeout(timer), resolve(res.statusCode ?? 0)));
      ws.once('error', (e) => (clearTimeout(timer), resolve(e.message)));
    });
    ws.terminate();
    expect(status).toBe(404);
  });

  it('greets a viewer, sends a snapshot, then batches of a run with totals; events arrive; annotation is refused to the viewer', async () => {
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'WS run', stopWhen: 'manual' }).expect(201)).body.run;
    const p = await open(await sessionCookie(t, 'viewer'));
    const hello = await p.next('hello');
    expect(hello.user.role).toBe('viewer');
    expect(Math.abs(hello.serverTimeMs - Date.now())).toBeLessThan(5000);
    p.send({ type: 'subscribe', topic: { kind: 'run', id: run.id } });
    const snap = await p.next('snapshot');
    expect(snap.run?.id).toBe(run.id);
    expect(snap.events.map((e) => e.type)).toContain('run-start');
    for (let s = 0; s < 20; s++) feed.emit(ids.benchId, { t: s, volts: 12, amps: 3, clock: 'device' });
    await p.next('batch', (b) => timeColumn(b.readings).includes(19));
    const batches = p.messages.filter((m) => m.type === 'batch');
    const t0 = batches.flatMap((b) => (b.type === 'batch' ? timeColumn(b.readings) : []));
    expect(t0).toEqual(Array.from({ length: 20 }, (_, i) => i));
    const last = batches[batches.length - 1]!;
    // 19 s at 3 A = 57/3600 Ah (constant current).
    if (last.type === 'batch') expect(last.readings.dischargeAh!.at(-1)).toBeCloseTo(57 / 3600, 12);
    // A run topic's time column is run time, never the source time `t`.
    if (last.type === 'batch') expect(['elapsedSeconds' in last.readings, 't' in last.readings]).toEqual([true, false]);
    // seq numbers the run's readings: the snapshot had none yet, each batch ends at its last reading.
    expect(snap.seq).toBe(0);
    expect(batches.map((b) => (b.type === 'batch' ? b.seq : -1)).at(-1)).toBe(20);
    let counted = 0;
    for (const b of batches) if (b.type === 'batch') expect(b.seq).toBe((counted += timeColumn(b.readings).length));

    await viewer.post(`/api/runs/${run.id}/events`).send({ text: 'viewer note' }).expect(403);
    await tech.post(`/api/runs/${run.id}/events`).send({ text: 'load switched on' }).expect(201);
    const ev = await p.next('event', (e) => e.event.type === 'annotation');
    expect(ev.event).toMatchObject({ type: 'annotation', text: 'load switched on', elapsedSeconds: 19 });
    expect(ev.eventId).toBeGreaterThan(0);
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    const change = await p.next('run', (m) => m.run.state === 'finished');
    expect(change.run.summary?.dischargeAh).toBeCloseTo(57 / 3600, 12);
  });

  it('a client that drops mid-run and subscribes again with its cursor gets exactly the readings it missed', async () => {
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'WS resume', stopWhen: 'manual' }).expect(201)).body.run;
    const topic = { kind: 'run', id: run.id };
    const first = await open(await sessionCookie(t, 'viewer'));
    first.send({ type: 'subscribe', topic });
    const snap = await first.next('snapshot');
    for (let s = 0; s < 30; s++) feed.emit(ids.benchId, { t: s, volts: 12.5, amps: 4, clock: 'device' });
    const lastSeen = await first.next('batch', (b) => timeColumn(b.readings).includes(29));
    const seen = first.messages.flatMap((m) => (m.type === 'batch' ? timeColumn(m.readings) : []));
    first.close(); // the connection drops
    for (let s = 30; s < 55; s++) feed.emit(ids.benchId, { t: s, volts: 12.4, amps: 4, clock: 'device' });

    const again = await open(await sessionCookie(t, 'viewer'));
    again.send({ type: 'subscribe', topic, after: { stream: snap.stream, seq: lastSeen.seq } });
    const resumed = await again.next('snapshot');
    expect(resumed.resume).toBe('resumed');
    for (let s = 55; s < 60; s++) feed.emit(ids.benchId, { t: s, volts: 12.4, amps: 4, clock: 'device' });
    await again.next('batch', (b) => timeColumn(b.readings).includes(59));
    const after = again.messages.flatMap((m) => (m.type === 'batch' ? timeColumn(m.readings) : []));
    // Every reading the server published, once, in order: nothing lost across the drop, nothing repeated.
    expect([...seen, ...timeColumn(resumed.recent), ...after]).toEqual(Array.from({ length: 60 }, (_, i) => i));

    // A cursor the server cannot serve (another stream: a restart) is told to refetch the history.
    const stale = await open(await sessionCookie(t, 'viewer'));
    stale.send({ type: 'subscribe', topic, after: { stream: 'before-restart', seq: 10 } });
    expect((await stale.next('snapshot')).resume).toBe('refetch');
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
  });

  it('answers ping, reports a bad message and an unknown run without closing', async () => {
    const p = await open(await sessionCookie(t, 'viewer'));
    p.send({ type: 'ping', id: 7 });
    expect((await p.next('pong')).id).toBe(7);
    p.send({ type: 'subscribe', topic: { kind: 'planet', id: 1 } });
    await p.next('error', (e) => /Invalid message/.test(e.message));
    p.ws.send('not json');
    p.send({ type: 'subscribe', topic: { kind: 'run', id: 987654 } });
    await p.next('error', (e) => e.topic?.id === 987654);
    p.send({ type: 'ping', id: 8 });
    expect((await p.next('pong', (m) => m.id === 8)).id).toBe(8);
  });

  it('streams a bench topic with status, and a client that stops reading does not slow another', async () => {
    const fast = await open(await sessionCookie(t, 'viewer'));
    const slow = await open(await sessionCookie(t, 'technician'));
    for (const p of [fast, slow]) p.send({ type: 'subscribe', topic: { kind: 'bench', id: ids.benchId } });
    await fast.next('snapshot');
    await slow.next('snapshot');
    feed.status(ids.benchId, { state: 'receiving', framesOk: 1, framesRejected: 0 });
    await fast.next('status', (s) => s.status.state === 'receiving');
    // The slow client stops reading: its socket's receive buffer fills, the server's backlog grows.
    // (ws resumes its socket whenever its parser drains, so keep it from doing that.)
    const slowSocket = (slow.ws as unknown as { _socket: { pause(): void; resume(): void } })._socket;
    slowSocket.pause();
    slowSocket.resume = () => undefined;
    // Fat readings (many probes), so the backlog outgrows what the kernel's socket buffers can absorb (several MB on loopback).
    const temps = Object.fromEntries(Array.from({ length: 40 }, (_, i) => [`probe${i}`, 20 + i / 7]));
    const FRAMES = 60_000;
    const sentAt: number[] = [];
    // Bursts spread over half a second or more, so the hub sends several batches (one per 100 ms).
    const BURST = 300;
    for (let i = 0; i < FRAMES; i += BURST) {
      for (let j = i; j < i + BURST; j++) feed.emit(ids.benchId, { t: 1_000_000 + j, volts: 12 + (j % 100) / 1000, amps: 2, temps, clock: 'device' });
      sentAt.push(Date.now());
      await new Promise((r) => setTimeout(r, 3));
    }
    const lastT = 1_000_000 + FRAMES - 1;
    const got = await fast.next('batch', (b) => timeColumn(b.readings).includes(lastT), 30_000);
    const lag = Date.now() - sentAt[sentAt.length - 1]!;
    const fastTs = fast.messages.flatMap((m) => (m.type === 'batch' ? timeColumn(m.readings) : [])).filter((x) => x >= 1_000_000);
    const fastDropped = fast.messages.reduce((s, m) => s + (m.type === 'batch' ? m.dropped : 0), 0);
    // The fast client kept up: the newest reading reached it promptly and (almost) everything
    // arrived; it shares this process with the emitter, so a rare reading may be thinned while
    // a multi-megabyte batch is in flight, and is then counted, never silently lost.
    expect(lag).toBeLessThan(2000);
    expect(fastTs[fastTs.length - 1]).toBe(lastT);
    expect(fastTs.length + fastDropped).toBe(FRAMES);
    expect(fastTs.length).toBeGreaterThan(FRAMES * 0.9);
    expect(timeColumn(got.readings).at(-1)).toBe(lastT);
    // A bench topic's time column is the source time `t`.
    expect(['t' in got.readings, 'elapsedSeconds' in got.readings]).toEqual([true, false]);
    // The slow client resumes: it was thinned (dropped counted), not allowed to stall the others.
    delete (slowSocket as { resume?: unknown }).resume; // back to the prototype's resume
    slowSocket.resume();
    // While its backlog drains the server may still hold readings back: keep the meter going.
    let extra = 0;
    const ticker = setInterval(() => feed.emit(ids.benchId, { t: lastT + ++extra, volts: 12, amps: 2, clock: 'device' }), 50);
    try {
      await slow.next('batch', (b) => timeColumn(b.readings).some((x) => x > lastT), 30_000);
    } finally {
      clearInterval(ticker);
    }
    const lastSeen = Math.max(...slow.messages.flatMap((m) => (m.type === 'batch' ? timeColumn(m.readings) : [])));
    const dropped = slow.messages.reduce((s, m) => s + (m.type === 'batch' ? m.dropped : 0), 0);
    const slowTs = slow.messages.flatMap((m) => (m.type === 'batch' ? timeColumn(m.readings) : [])).filter((x) => x >= 1_000_000);
    expect(dropped).toBeGreaterThan(FRAMES / 10);
    // Every reading up to the newest one it saw was either sent or counted as dropped.
    expect(slowTs.length + dropped).toBe(lastSeen - 1_000_000 + 1);
  });
});

describe('bench topic carries its current run', () => {
  it('snapshots the live run on a bench and sends run messages on start, state change and end', async () => {
    const admin = await signInAs(t, 'admin');
    const own = await batteryAndBench(admin);
    const bench = { kind: 'bench' as const, id: own.benchId };
    const p = await open(await sessionCookie(t, 'viewer'));
    p.send({ type: 'subscribe', topic: bench });
    expect((await p.next('snapshot')).run).toBeNull();

    const run = (await tech.post('/api/runs').send({ ...own, name: 'Bench topic run', stopWhen: 'manual' }).expect(201)).body.run;
    const armed = await p.next('run', (m) => m.topic.kind === 'bench' && m.run.id === run.id);
    expect(armed.topic).toEqual(bench);
    expect(armed.run.state).toBe('armed');

    feed.emit(own.benchId, { t: 0, volts: 13.1, amps: 5, clock: 'device' });
    await p.next('run', (m) => m.topic.kind === 'bench' && m.run.state === 'recording');

    const late = await open(await sessionCookie(t, 'viewer'));
    late.send({ type: 'subscribe', topic: bench });
    const snap = await late.next('snapshot');
    expect(snap.run?.id).toBe(run.id);
    expect(snap.run?.state).toBe('recording');

    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await p.next('run', (m) => m.topic.kind === 'bench' && m.run.state === 'finished');
    const after = await open(await sessionCookie(t, 'viewer'));
    after.send({ type: 'subscribe', topic: bench });
    expect((await after.next('snapshot')).run).toBeNull();
  });
});
