import { describe, expect, it } from 'vitest';
import type { SessionUser } from '../auth/session-user.js';
import { BACKPRESSURE_HIGH_BYTES } from './backpressure-policy.js';
import { ClientSender, type SocketLike } from './client-sender.js';
import { LiveHub, MAX_SUBSCRIPTIONS_PER_CLIENT, MIN_BATCH_INTERVAL_MS } from './live-hub.js';

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
    hub.publishSample({ kind: 'bench', id: 3 }, frame(0));
    hub.publishSample({ kind: 'bench', id: 3 }, frame(1));
    hub.publishSample({ kind: 'bench', id: 3 }, frame(2));
    const batches = () => sock.sent.filter((m) => m.type === 'batch') as { readings: { t: number[] } }[];
    expect(batches().map((b) => b.readings.t)).toEqual([[0]]);
    advance(MIN_BATCH_INTERVAL_MS - 1);
    expect(batches()).toHaveLength(1);
    advance(1);
    expect(batches().map((b) => b.readings.t)).toEqual([[0], [1, 2]]);
    expect(sock.sent.map((m) => m.seq)).toEqual([1, 2, 3]);
  });

  it('never drops an event, even for a client too far behind to get readings', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = async () => ({ run: null, events: [] });
    await hub.subscribe(c, { kind: 'run', id: 9 });
    sock.bufferedAmount = BACKPRESSURE_HIGH_BYTES * 2;
    const reading = { ...frame(0), elapsedSeconds: 0, watts: 12, dischargeWh: 0, dischargeAh: 0, chargeWh: 0, chargeAh: 0 };
    hub.publishSample({ kind: 'run', id: 9 }, reading);
    hub.publishEvent(9, { type: 'annotation', t: 0, text: 'note' }, 5);
    expect(sock.sent.filter((m) => m.type === 'batch')).toHaveLength(0);
    expect(sock.sent.filter((m) => m.type === 'event')).toHaveLength(1);
    // Once it drains it hears how many readings it missed.
    sock.bufferedAmount = 0;
    hub.publishSample({ kind: 'run', id: 9 }, { ...reading, t: 1, elapsedSeconds: 1 });
    hub.publishEvent(9, { type: 'annotation', t: 1, text: 'flush' }, 6);
    const batch = sock.sent.find((m) => m.type === 'batch') as { dropped: number; readings: { t: number[] } };
    expect(batch.dropped).toBe(1);
    expect(batch.readings.t).toEqual([1]);
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
    hub.publishSample({ kind: 'bench', id: 1 }, frame(0));
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
    hub.publishSample({ kind: 'bench', id: 1 }, frame(0));
    hub.removeClient(c);
    expect(hub.topicCount()).toBe(1);
  });

  it('forgets an ended run once its last viewer leaves', async () => {
    const { hub } = setup();
    const sock = new FakeSocket();
    const c = new ClientSender(sock, user);
    (hub as unknown as { opts: { source: { run: unknown } } }).opts.source.run = async () => ({ run: null, events: [] });
    await hub.subscribe(c, { kind: 'run', id: 4 });
    hub.publishSample({ kind: 'run', id: 4 }, { ...frame(0), elapsedSeconds: 0, watts: 12, dischargeWh: 0, dischargeAh: 0, chargeWh: 0, chargeAh: 0 });
    hub.publishRun({ id: 4, benchId: null, state: 'finished' } as unknown as Parameters<typeof hub.publishRun>[0]);
    expect(hub.topicCount()).toBe(1);
    hub.unsubscribe(c, { kind: 'run', id: 4 });
    expect(hub.topicCount()).toBe(0);
  });
});
