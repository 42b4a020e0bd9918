import { describe, expect, it } from 'vitest';
import { ClientMessageSchema, type ReadingColumns, type ServerMessage, type Topic } from '../../shared/schemas/ws';
import { LiveSocket } from './live-socket';
import { LIVE_COLUMN, LiveStore } from './live-store';

/** A socket the fake server below drives; the client sees it as a browser WebSocket. */
class FakeSocket {
  readyState = 0;
  readonly sent: unknown[] = [];
  onopen: (() => void) | null = null;
  onmessage: ((e: { data: string }) => void) | null = null;
  onclose: (() => void) | null = null;
  constructor(private readonly server: FakeServer) {}
  send(text: string) {
    this.sent.push(JSON.parse(text));
    this.server.receive(this, ClientMessageSchema.parse(JSON.parse(text)));
  }
  close() {
    if (this.readyState === 3) return;
    this.readyState = 3;
    this.server.sockets.delete(this);
    this.onclose?.();
  }
  deliver(message: ServerMessage) {
    if (this.readyState === 1) this.onmessage?.({ data: JSON.stringify(message) });
  }
}

const cols = (elapsedSeconds: number[]): ReadingColumns => ({ elapsedSeconds, volts: elapsedSeconds.map(() => 12), amps: elapsedSeconds.map(() => 3), watts: elapsedSeconds.map(() => 36), temps: {} });

/**
 * The server's side of the cursor protocol (docs/api.md, WebSocket): readings numbered from 1
 * in one stream, the last `keep` of them kept; a subscribe with a cursor gets exactly the
 * readings after it, or `refetch` when they are no longer kept.
 */
class FakeServer {
  readonly sockets = new Set<FakeSocket>();
  readonly readings: number[] = [];
  constructor(
    private readonly topic: Topic,
    private readonly keep: number,
  ) {}
  open(socket: FakeSocket) {
    this.sockets.add(socket);
    socket.readyState = 1;
    socket.onopen?.();
  }
  receive(socket: FakeSocket, message: ReturnType<typeof ClientMessageSchema.parse>) {
    if (message.type !== 'subscribe') return;
    const seq = this.readings.length;
    const firstKept = Math.max(1, seq - this.keep + 1);
    const after = message.after;
    const resumed = after !== undefined && after.stream === 'stream-1' && after.seq <= seq && after.seq + 1 >= firstKept;
    const recent = resumed ? this.readings.slice(after.seq) : this.readings.slice(firstKept - 1);
    const resume = !after ? 'fresh' : resumed ? 'resumed' : 'refetch';
    socket.deliver({ type: 'snapshot', stream: 'stream-1', seq, resume, topic: this.topic, status: null, run: null, recent: cols(recent), events: [] });
  }
  /** Publishes readings at 1 s intervals; connected clients get them as one batch. */
  publish(count: number) {
    const from = this.readings.length + 1;
    const t = Array.from({ length: count }, (_, i) => from + i);
    this.readings.push(...t);
    for (const s of this.sockets) s.deliver({ type: 'batch', seq: this.readings.length, topic: this.topic, readings: cols(t), dropped: 0 });
  }
}

function setup(keep: number) {
  const topic: Topic = { kind: 'run', id: 7 };
  const server = new FakeServer(topic, keep);
  const sockets: FakeSocket[] = [];
  const timers: (() => void)[] = [];
  const live = new LiveSocket({
    url: 'ws://test/ws',
    createSocket: () => {
      const s = new FakeSocket(server);
      sockets.push(s);
      return s as unknown as WebSocket;
    },
    setTimer: (fn) => timers.push(fn),
    clearTimer: () => undefined,
  });
  const store = new LiveStore((fn) => fn());
  const refetches: (number | null)[] = [];
  store.onSnapshot((firstT) => refetches.push(firstT));
  live.subscribe(topic, (m) => store.handle(m));
  return { server, sockets, timers, store, refetches };
}

/** The store's rows as reading times; a gap row shows as null. */
function storedTimes(store: LiveStore): (number | null)[] {
  const out: (number | null)[][] = Array.from({ length: 5 }, () => []);
  store.buffer.copyOrdered(out);
  return out[LIVE_COLUMN.time].map((t, i) => (out[LIVE_COLUMN.volts][i] === null ? null : t));
}

describe('reconnect with the reading cursor', () => {
  it('a socket dropped mid-run resumes from its cursor: the client holds every reading once, with no gap', () => {
    const { server, sockets, timers, store, refetches } = setup(1_000);
    server.publish(20);
    server.open(sockets[0]);
    server.publish(30);
    sockets[0].close(); // the connection drops
    server.publish(25); // readings the client misses while it is away
    timers.shift()!(); // the back-off elapses: a new socket
    server.open(sockets[1]);
    server.publish(10);

    expect(sockets[1].sent).toEqual([{ type: 'subscribe', topic: { kind: 'run', id: 7 }, after: { stream: 'stream-1', seq: 50 } }]);
    expect(storedTimes(store)).toEqual(server.readings);
    // The reconnect needed no history from the archive: only the first open asked for it.
    expect(refetches).toEqual([1]);
  });

  it('a cursor older than the server keeps is told to refetch the history, and the live rows never repeat', () => {
    const { server, sockets, timers, store, refetches } = setup(10);
    server.open(sockets[0]);
    server.publish(5);
    sockets[0].close();
    server.publish(40); // more than the server keeps
    timers.shift()!();
    server.open(sockets[1]);
    server.publish(3);

    expect(refetches).toEqual([null, 36]);
    const times = storedTimes(store);
    const values = times.filter((t): t is number => t !== null);
    expect(new Set(values).size).toBe(values.length);
    // What cannot be recovered live is drawn as a gap, never a line across the outage.
    expect(times.slice(0, 7)).toEqual([1, 2, 3, 4, 5, null, 36]);
    expect(values.slice(-3)).toEqual([46, 47, 48]);
  });
});
