import { describe, expect, it } from 'vitest';
import type { SessionUser } from '../auth/session-user.js';
import {
  CLIENT_BUDGET_BYTES,
  CLIENT_HARD_LIMIT_BYTES,
  OVER_BUDGET_GRACE_MS,
  READINGS_STOP_BYTES,
  THIN_ENTER_BYTES,
  THIN_LEAVE_BYTES,
} from './backpressure-policy.js';
import { ClientSender, type SocketLike } from './client-sender.js';
import { LiveHub, MAX_SUBSCRIPTIONS_PER_CLIENT, MIN_BATCH_INTERVAL_MS, RECENT_READINGS, RESUME_READINGS } from './live-hub.js';

const user: SessionUser = { id: 1, email: 'v@lab', name: 'V', role: 'viewer', disabled: false };
class FakeSocket implements SocketLike {
  bufferedAmount = 0;
  readyState = 1;
  sent: Record<string, unknown>[] = [];
  send(data: string) {
    this.sent.push(JSON.parse(data));
  }
}

function setup() {
  let now = 0;
  const timers: { at: number; fn: () => void }[] = [];
  const hub = new LiveHub({
    source: { benchStatus: () => ({ state: 'receiving', framesOk: 0, framesRejected: 0 }), run: async () => null },
    now: () => now,
    setTimer: (fn, ms) => {
      const t = { at: now + ms, fn };
      timers.push(t);
      return t;
    },
    clearTimer: (h) => timers.splice(timers.indexOf(h as (typeof timers)[number]), 1),
  });
  const advance = (ms: number) => {
    now += ms;
    for (const t of timers.filter((x) => x.at <= now)) {
      timers.splice(timers.indexOf(t), 1);
      t.fn();
    }
  };
  return { hub, advance };
}
const frame = (t: number) => ({ t, volts: 12, amps: 1, clock: 'device' as const });

describe('LiveHub', () => {
  it('sends a topic at most once per 100 ms, at once when the last batch is older', async () => {
    const { hub, advance } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    await hub.subscribe(c, { kind: 'bench', id: 3 });
    hub.publishReading({ kind: 'bench', id: 3 }, frame(0));
    hub.publishReading({ kind: 'bench', id: 3 }, frame(1));
    hub.publishReading({ kind: 'bench', id: 3 }, frame(2));
    const batches = () => sock.sent.filter((m) => m.type === 'batch') as { readings: { t: number[] } }[];
    expect(batches().map((b) => b.readings.t)).toEqual([[0]]);
    advance(MIN_BATCH_INTERVAL_MS - 1);
    expect(batches()).toHaveLength(1);
    advance(1);
    expect(batches().map((b) => b.readings.t)).toEqual([[0], [1, 2]]);
    // The snapshot had no readings; each batch carries the number of its last reading.
    expect(sock.sent.map((m) => m.seq)).toEqual([0, 1, 3]);
  });

  it('never drops an event, even for a client too far behind to get readings', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = async () => ({ run: null, events: [] });
    await hub.subscribe(c, { kind: 'run', id: 9 });
    sock.bufferedAmount = READINGS_STOP_BYTES * 2;
    const reading = { ...frame(0), elapsedSeconds: 0, watts: 12, dischargeWh: 0, dischargeAh: 0, chargeWh: 0, chargeAh: 0 };
    hub.publishReading({ kind: 'run', id: 9 }, reading);
    hub.publishEvent(9, { type: 'annotation', elapsedSeconds: 0, text: 'note' }, 5);
    expect(sock.sent.filter((m) => m.type === 'batch')).toHaveLength(0);
    expect(sock.sent.filter((m) => m.type === 'event')).toHaveLength(1);
    // Once it drains it hears how many readings it missed.
    sock.bufferedAmount = 0;
    hub.publishReading({ kind: 'run', id: 9 }, { ...reading, t: 1001, elapsedSeconds: 1 });
    hub.publishEvent(9, { type: 'annotation', elapsedSeconds: 1, text: 'flush' }, 6);
    const batch = sock.sent.find((m) => m.type === 'batch') as { dropped: number; readings: { elapsedSeconds: number[]; t?: number[] } };
    expect(batch.dropped).toBe(1);
    // A run topic's time column is run time; the source time `t` is not sent.
    expect(batch.readings.elapsedSeconds).toEqual([1]);
    expect(batch.readings.t).toBeUndefined();
  });

  it('stops sending to a client that unsubscribed or left', async () => {
    const { hub, advance } = setup();
    const a = new FakeSocket();
    const b = new FakeSocket();
    const ca = new ClientSender(a, user);
    const cb = new ClientSender(b, user);
    await hub.subscribe(ca, { kind: 'bench', id: 1 });
    await hub.subscribe(cb, { kind: 'bench', id: 1 });
    hub.unsubscribe(ca, { kind: 'bench', id: 1 });
    hub.removeClient(cb);
    hub.publishReading({ kind: 'bench', id: 1 }, frame(0));
    advance(1000);
    expect([...a.sent, ...b.sent].filter((m) => m.type === 'batch')).toHaveLength(0);
  });
});

describe('LiveHub memory under hostile subscriptions', () => {
  it('caps one client\'s subscriptions and forgets empty topics when clients leave', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    for (let id = 1; id <= MAX_SUBSCRIPTIONS_PER_CLIENT + 100; id++) await hub.subscribe(c, { kind: 'bench', id });
    expect(c.subscriptions.size).toBe(MAX_SUBSCRIPTIONS_PER_CLIENT);
    expect(sock.sent.filter((m) => m.type === 'error')).toHaveLength(100);
    expect(hub.topicCount()).toBe(MAX_SUBSCRIPTIONS_PER_CLIENT);
    // A bench with readings keeps its recent buffer for the next viewer; made-up ids go.
    hub.publishReading({ kind: 'bench', id: 1 }, frame(0));
    hub.removeClient(c);
    expect(hub.topicCount()).toBe(1);
  });

  it('forgets an ended run once its last viewer leaves', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = async () => ({ run: null, events: [] });
    await hub.subscribe(c, { kind: 'run', id: 4 });
    hub.publishReading({ kind: 'run', id: 4 }, { ...frame(0), elapsedSeconds: 0, watts: 12, dischargeWh: 0, dischargeAh: 0, chargeWh: 0, chargeAh: 0 });
    hub.publishRun({ id: 4, benchId: null, state: 'finished' } as unknown as Parameters<typeof hub.publishRun>[0]);
    expect(hub.topicCount()).toBe(1);
    hub.unsubscribe(c, { kind: 'run', id: 4 });
    expect(hub.topicCount()).toBe(0);
  });
});

/** A socket whose peer never reads: every byte sent stays buffered. */
class StuckSocket extends FakeSocket {
  override send(data: string) {
    super.send(data);
    this.bufferedAmount += Buffer.byteLength(data);
  }
}

describe('LiveHub: a byte budget per client for every message type', () => {
  it('closes a client that only asks for snapshots and never reads, at the hard limit at the latest', async () => {
    const { hub } = setup();
    const sock = new StuckSocket();
    let closed = 0;
    const c = new ClientSender(sock, user, { now: () => 0, onOverBudget: () => closed++ });
    // A busy bench: each snapshot carries its RECENT_READINGS.
    for (let i = 0; i < RECENT_READINGS; i++) hub.publishReading({ kind: 'bench', id: 1 }, frame(i));
    let pairs = 0;
    while (closed === 0 && pairs < 100_000) {
      await hub.subscribe(c, { kind: 'bench', id: 1 });
      hub.unsubscribe(c, { kind: 'bench', id: 1 });
      pairs++;
    }
    expect(closed).toBe(1);
    expect(sock.bufferedAmount).toBeGreaterThanOrEqual(CLIENT_HARD_LIMIT_BYTES);
    const sentBefore = sock.sent.length;
    // Once closing it is sent nothing more and its requests are not served.
    await hub.subscribe(c, { kind: 'bench', id: 1 });
    c.send({ type: 'pong', serverTimeMs: 0 });
    expect(sock.sent.length).toBe(sentBefore);
    expect(sock.bufferedAmount).toBeLessThan(CLIENT_HARD_LIMIT_BYTES + 64 * 1024);
    expect(closed).toBe(1);
  });

  it('closes a client over its budget for the grace period even when only pongs and errors go out', () => {
    let now = 0;
    const sock = new FakeSocket();
    let closed = 0;
    const c = new ClientSender(sock, user, { now: () => now, onOverBudget: () => closed++ });
    sock.bufferedAmount = CLIENT_BUDGET_BYTES;
    c.send({ type: 'pong', serverTimeMs: 0 });
    now += OVER_BUDGET_GRACE_MS - 1;
    c.send({ type: 'error', message: 'x' });
    expect(closed).toBe(0);
    now += 1;
    // Nothing new to send: the periodic check alone closes it.
    c.checkBudget();
    expect(closed).toBe(1);
  });

  it('sends every event to a client too far behind for readings, until the budget closes it', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    let closed = 0;
    let now = 0;
    const c = new ClientSender(sock, user, { now: () => now, onOverBudget: () => closed++ });
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = async () => ({ run: null, events: [] });
    await hub.subscribe(c, { kind: 'run', id: 2 });
    sock.bufferedAmount = CLIENT_BUDGET_BYTES;
    for (let i = 0; i < 5; i++) hub.publishEvent(2, { type: 'annotation', elapsedSeconds: i, text: `n${i}` }, i);
    expect(sock.sent.filter((m) => m.type === 'event')).toHaveLength(5);
    now = OVER_BUDGET_GRACE_MS;
    hub.publishEvent(2, { type: 'annotation', elapsedSeconds: 9, text: 'late' }, 9);
    expect(closed).toBe(1);
    expect(c.isOpen).toBe(false);
  });

  it('thins readings with hysteresis: between the marks, a thinning client stays thinned', async () => {
    const { hub, advance } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    await hub.subscribe(c, { kind: 'bench', id: 5 });
    const batchSizes: number[] = [];
    const publish = (n: number) => {
      for (let i = 0; i < n; i++) hub.publishReading({ kind: 'bench', id: 5 }, frame(i));
      advance(MIN_BATCH_INTERVAL_MS);
      const batches = sock.sent.filter((m) => m.type === 'batch') as { readings: { t: number[] } }[];
      batchSizes.push(batches.reduce((n, b) => n + b.readings.t.length, 0));
      sock.sent.length = 0;
    };
    const between = (THIN_LEAVE_BYTES + THIN_ENTER_BYTES) / 2;
    sock.bufferedAmount = between;
    publish(16); // never entered: everything
    sock.bufferedAmount = THIN_ENTER_BYTES + 1;
    publish(16); // entered: thinned
    sock.bufferedAmount = between;
    publish(16); // still thinned between the marks
    sock.bufferedAmount = THIN_LEAVE_BYTES - 1;
    publish(16); // left below the low mark
    expect(batchSizes[0]).toBe(16);
    expect(batchSizes[1]).toBeLessThan(16);
    expect(batchSizes[2]).toBeLessThan(16);
    expect(batchSizes[3]).toBe(16);
  });
});

describe('LiveHub: subscribes that complete late', () => {
  function deferredRuns(hub: LiveHub) {
    const waiting: (() => void)[] = [];
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = () =>
      new Promise((resolve) => waiting.push(() => resolve({ run: { id: 1 }, events: [] })));
    return () => {
      for (const w of waiting.splice(0)) w();
    };
  }

  it('keeps nothing of a subscribe that completes after its socket closed', async () => {
    const { hub } = setup();
    const release = deferredRuns(hub);
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    const pending = hub.subscribe(c, { kind: 'run', id: 7 });
    sock.readyState = 3; // CLOSED
    hub.removeClient(c);
    release();
    await pending;
    expect(c.subscriptions.size).toBe(0);
    expect(c.pendingSubscribes.size).toBe(0);
    expect(hub.topicCount()).toBe(0);
  });

  it('counts subscribes still waiting against the cap, so a burst cannot exceed it', async () => {
    const { hub } = setup();
    const release = deferredRuns(hub);
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    const burst = Array.from({ length: MAX_SUBSCRIPTIONS_PER_CLIENT + 36 }, (_, i) => hub.subscribe(c, { kind: 'run', id: i + 1 }));
    release();
    await Promise.all(burst);
    expect(c.subscriptions.size).toBe(MAX_SUBSCRIPTIONS_PER_CLIENT);
    expect(sock.sent.filter((m) => m.type === 'error')).toHaveLength(36);
    expect(hub.topicCount()).toBe(MAX_SUBSCRIPTIONS_PER_CLIENT);
  });

  it('an unsubscribe while the subscribe waits cancels it', async () => {
    const { hub } = setup();
    const release = deferredRuns(hub);
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    const pending = hub.subscribe(c, { kind: 'run', id: 3 });
    hub.unsubscribe(c, { kind: 'run', id: 3 });
    release();
    await pending;
    expect(c.subscriptions.size).toBe(0);
    expect(sock.sent.filter((m) => m.type === 'snapshot')).toHaveLength(0);
  });
});

describe('LiveHub snapshots', () => {
  it('a snapshot holds the readings up to its moment, also after earlier snapshots of the topic', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    for (let i = 0; i < 3; i++) hub.publishReading({ kind: 'bench', id: 8 }, frame(i));
    await hub.subscribe(c, { kind: 'bench', id: 8 });
    hub.unsubscribe(c, { kind: 'bench', id: 8 });
    await hub.subscribe(c, { kind: 'bench', id: 8 });
    hub.unsubscribe(c, { kind: 'bench', id: 8 });
    hub.publishReading({ kind: 'bench', id: 8 }, frame(3));
    await hub.subscribe(c, { kind: 'bench', id: 8 });
    const snaps = sock.sent.filter((m) => m.type === 'snapshot') as { topic: unknown; status: unknown; recent: { t: number[]; volts: number[] }; events: unknown[] }[];
    expect(snaps.map((s) => s.recent.t)).toEqual([[0, 1, 2], [0, 1, 2], [0, 1, 2, 3]]);
    expect(snaps[2]).toMatchObject({ topic: { kind: 'bench', id: 8 }, status: { state: 'receiving' }, events: [] });
    expect(snaps[2]!.recent.volts).toEqual([12, 12, 12, 12]);
  });
});

describe('LiveHub reading cursor', () => {
  type Snap = { stream: string; seq: number; resume: string; recent: { t: number[] } };
  type Batch = { seq: number; readings: { t: number[] } };
  const topic = { kind: 'bench', id: 9 } as const;

  it('numbers readings per topic; a subscribe with a cursor gets exactly the readings after it', async () => {
    const { hub, advance } = setup();
    const first = new FakeSocket();
    const a = new ClientSender(first, user);
    for (let i = 0; i < 5; i++) hub.publishReading(topic, frame(i));
    await hub.subscribe(a, topic);
    const snap = first.sent.find((m) => m.type === 'snapshot') as Snap;
    expect(snap).toMatchObject({ seq: 5, resume: 'fresh', recent: { t: [0, 1, 2, 3, 4] } });
    hub.publishReading(topic, frame(5));
    advance(MIN_BATCH_INTERVAL_MS);
    hub.publishReading(topic, frame(6));
    advance(MIN_BATCH_INTERVAL_MS);
    const batches = first.sent.filter((m) => m.type === 'batch') as Batch[];
    expect(batches.map((b) => [b.seq, b.readings.t])).toEqual([[6, [5]], [7, [6]]]);
    hub.removeClient(a); // the connection drops after reading 7
    for (let i = 7; i < 12; i++) hub.publishReading(topic, frame(i));

    const second = new FakeSocket();
    await hub.subscribe(new ClientSender(second, user), topic, { stream: snap.stream, seq: 7 });
    expect(second.sent[0]).toMatchObject({ type: 'snapshot', seq: 12, resume: 'resumed', recent: { t: [7, 8, 9, 10, 11] } });
  });

  it('a subscribe while readings wait for their batch: the snapshot ends where the next batch begins', async () => {
    const { hub, advance } = setup();
    const watcher = new FakeSocket();
    await hub.subscribe(new ClientSender(watcher, user), topic);
    hub.publishReading(topic, frame(0)); // sent at once
    hub.publishReading(topic, frame(1)); // waits for the batch interval
    const late = new FakeSocket();
    await hub.subscribe(new ClientSender(late, user), topic);
    hub.publishReading(topic, frame(2));
    advance(MIN_BATCH_INTERVAL_MS);
    const seen = late.sent.flatMap((m) => (m.type === 'snapshot' ? (m as unknown as Snap).recent.t : m.type === 'batch' ? (m as unknown as Batch).readings.t : []));
    expect(seen).toEqual([0, 1, 2]);
    const watched = watcher.sent.flatMap((m) => (m.type === 'batch' ? (m as unknown as Batch).readings.t : []));
    expect(watched).toEqual([0, 1, 2]);
  });

  it('a cursor older than the readings kept, ahead of the stream, or of another stream is told to refetch', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    await hub.subscribe(c, topic);
    const { stream } = sock.sent[0] as unknown as Snap;
    const total = 2 * RESUME_READINGS + 10;
    for (let i = 0; i < total; i++) hub.publishReading(topic, frame(i));
    const ask = async (after: { stream: string; seq: number }) => {
      const s = new FakeSocket();
      await hub.subscribe(new ClientSender(s, user), topic, after);
      return s.sent[0] as unknown as Snap;
    };
    // After a trim the ring holds RESUME_READINGS to twice that; a cursor before it cannot resume.
    expect((await ask({ stream, seq: 1 })).resume).toBe('refetch');
    const refetch = await ask({ stream, seq: 1 });
    expect(refetch.recent.t).toHaveLength(RECENT_READINGS);
    expect(refetch.recent.t.at(-1)).toBe(total - 1);
    expect((await ask({ stream, seq: total - RESUME_READINGS })).recent.t).toHaveLength(RESUME_READINGS);
    expect((await ask({ stream, seq: total + 1 })).resume).toBe('refetch');
    expect((await ask({ stream: 'another', seq: total - 1 })).resume).toBe('refetch');
    expect(await ask({ stream, seq: total })).toMatchObject({ resume: 'resumed', recent: { t: [] } });
  });
});
