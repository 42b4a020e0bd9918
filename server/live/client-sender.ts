import type { Topic } from '../../shared/schemas/ws.js';
import { topicKey } from '../../shared/schemas/ws.js';
import type { SessionUser } from '../auth/session-user.js';
import { keepEveryFor, thinIndices } from './backpressure-policy.js';
import { toReadingColumns, type LiveSample } from './reading-columns.js';

/** The part of a `ws` WebSocket the sender uses (tests pass a fake). */
export interface SocketLike {
  readonly bufferedAmount: number;
  readonly readyState: number;
  send(data: string): void;
}
const OPEN = 1;

/**
 * One connected client: its subscriptions, its message counter, and how far behind it
 * is. Payloads arrive already serialised without `seq`; the sender splices its own
 * counter in, so a payload shared by many clients is built once.
 */
export class ClientSender {
  private seq = 0;
  readonly subscriptions = new Set<string>();
  private readonly phase = new Map<string, number>();
  private readonly dropped = new Map<string, number>();
  /** Readings thinned away over the life of the connection (for the benchmark and logs). */
  droppedTotal = 0;

  constructor(
    private readonly socket: SocketLike,
    readonly user: SessionUser,
  ) {}

  get lastSeq(): number {
    return this.seq;
  }

  /** Sends a payload (`{"type":…}` JSON without seq). Never throws: a closing socket just misses it. */
  sendPayload(json: string): void {
    if (this.socket.readyState !== OPEN) return;
    const seq = ++this.seq;
    try {
      this.socket.send(`{"seq":${seq},${json.slice(1)}`);
    } catch {
      // The socket is closing; the heartbeat and close handler clean it up.
    }
  }

  /** Serialises and sends one message. */
  send(message: { type: string } & Record<string, unknown>): void {
    this.sendPayload(JSON.stringify(message));
  }

  /**
   * Sends a batch of readings, thinned to what this socket can take. `shared` is the
   * unthinned payload for clients that keep up and have nothing dropped to report.
   */
  sendBatch(topic: Topic, samples: readonly LiveSample[], shared: () => string): void {
    const key = topicKey(topic);
    const keepEvery = keepEveryFor(this.socket.bufferedAmount);
    const owed = this.dropped.get(key) ?? 0;
    if (keepEvery === 1 && owed === 0) return this.sendPayload(shared());
    const { keep, phase } = thinIndices(samples.length, keepEvery, this.phase.get(key) ?? 0);
    this.phase.set(key, phase);
    const droppedNow = samples.length - keep.length;
    this.droppedTotal += droppedNow;
    if (keep.length === 0) {
      this.dropped.set(key, owed + droppedNow);
      return;
    }
    this.dropped.set(key, 0);
    this.send({ type: 'batch', topic, readings: toReadingColumns(samples, keep), dropped: owed + droppedNow });
  }
}
