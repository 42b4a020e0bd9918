import { describe, expect, it } from 'vitest';
import { LiveSocket, RECONNECT_DELAYS_MS } from './live-socket';

class FakeSocket {
  static OPEN = 1;
  readyState = 0;
  sent: unknown[] = [];
  onopen: (() => void) | null = null;
  onmessage: ((e: { data: string }) => void) | null = null;
  onclose: (() => void) | null = null;
  send(text: string) {
    this.sent.push(JSON.parse(text));
  }
  close() {
    this.readyState = 3;
    this.onclose?.();
  }
  open() {
    this.readyState = 1;
    this.onopen?.();
  }
}

function setup() {
  const sockets: FakeSocket[] = [];
  const timers: { fn: () => void; ms: number }[] = [];
  const live = new LiveSocket({
    url: 'ws://test/ws',
    createSocket: () => {
      const s = new FakeSocket();
      sockets.push(s);
      return s as unknown as WebSocket;
    },
    setTimer: (fn, ms) => timers.push({ fn, ms }),
    clearTimer: () => undefined,
  });
  return { live, sockets, timers };
}

const topic = { kind: 'bench', id: 3 } as const;

describe('LiveSocket', () => {
  it('subscribes on open and routes messages to the topic listener only when valid', () => {
    globalThis.WebSocket = FakeSocket as unknown as typeof WebSocket;
    const { live, sockets } = setup();
    const got: string[] = [];
    live.subscribe(topic, (m) => got.push(m.type));
    sockets[0].open();
    expect(sockets[0].sent).toEqual([{ type: 'subscribe', topic }]);
    sockets[0].onmessage?.({ data: JSON.stringify({ type: 'status', topic, status: { state: 'receiving', framesOk: 3, framesRejected: 0 } }) });
    sockets[0].onmessage?.({ data: '{"type":"status","seq":"not a number"}' });
    sockets[0].onmessage?.({ data: 'garbage' });
    sockets[0].onmessage?.({ data: JSON.stringify({ type: 'status', topic: { kind: 'bench', id: 4 }, status: { state: 'idle', framesOk: 0, framesRejected: 0 } }) });
    expect(got).toEqual(['status']);
  });

  it('reconnects with growing back-off and subscribes again', () => {
    globalThis.WebSocket = FakeSocket as unknown as typeof WebSocket;
    const { live, sockets, timers } = setup();
    live.subscribe(topic, () => undefined);
    sockets[0].open();
    sockets[0].close();
    expect(live.state).toBe('closed');
    expect(timers[0].ms).toBe(RECONNECT_DELAYS_MS[0]);
    timers[0].fn();
    sockets[1].close(); // the server is still down
    expect(timers[1].ms).toBe(RECONNECT_DELAYS_MS[1]);
    timers[1].fn();
    sockets[2].open();
    expect(live.state).toBe('open');
    expect(sockets[2].sent).toEqual([{ type: 'subscribe', topic }]);
  });

  it('unsubscribes when the last listener leaves', () => {
    globalThis.WebSocket = FakeSocket as unknown as typeof WebSocket;
    const { live, sockets } = setup();
    const stopA = live.subscribe(topic, () => undefined);
    const stopB = live.subscribe(topic, () => undefined);
    sockets[0].open();
    stopA();
    expect(sockets[0].sent).toHaveLength(1);
    stopB();
    expect(sockets[0].sent[1]).toEqual({ type: 'unsubscribe', topic });
  });

  it('learns the server clock offset from hello', () => {
    globalThis.WebSocket = FakeSocket as unknown as typeof WebSocket;
    const { live, sockets } = setup();
    live.subscribe(topic, () => undefined);
    sockets[0].open();
    const serverAheadMs = 90_000;
    sockets[0].onmessage?.({ data: JSON.stringify({ type: 'hello', serverTimeMs: Date.now() + serverAheadMs, user: { id: 1, role: 'viewer' } }) });
    expect(Math.abs(live.clockOffsetMs - serverAheadMs)).toBeLessThan(1_000);
  });
});
