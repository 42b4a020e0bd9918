import type { Topic } from '../../shared/schemas/ws.js';
import { topicKey } from '../../shared/schemas/ws.js';
import type { SessionUser } from '../auth/session-user.js';
import { checkBudget, keepEveryFor, nextThinning, thinIndices, type BudgetState } from './backpressure-policy.js';
import { toReadingColumns, type LiveReading } from '../readings/reading-columns.js';

/** The part of a `ws` WebSocket the sender uses (tests pass a fake). */
export interface SocketLike {
  readonly bufferedAmount: number;
  readonly readyState: number;
  send(data: string): void;
}

/** Options of a ClientSender. */
export interface ClientSenderOptions {
  /** Clock for the budget's grace period (default performance.now). */
  now?: () => number;
  /** Called once when the client went over its byte budget for too long: close it. */
  onOverBudget?: () => void;
}

const OPEN = 1;

/**
 * One connected client: its subscriptions and how far behind it is. Payloads arrive
 * already serialised, so a payload shared by many clients is built once. Every message counts
 * against the client's byte budget (backpressure-policy.ts); nothing is dropped silently:
 * readings are thinned and counted, anything else is sent, and a client that cannot keep
 * up is closed.
 */
export class ClientSender {
  readonly subscriptions = new Set<string>();
  /** Subscribes waiting for their snapshot's data, by topic key (they count against the cap). */
  readonly pendingSubscribes = new Map<string, symbol>();
  private readonly phase = new Map<string, number>();
  private readonly dropped = new Map<string, number>();
  private thinning = false;
  private budget: BudgetState = { overSinceMs: null, close: false };
  private readonly now: () => number;
  /** Readings thinned away over the life of the connection (for the benchmark and logs). */
  droppedTotal = 0;

  constructor(
    private readonly socket: SocketLike,
    readonly user: SessionUser,
    private readonly opts: ClientSenderOptions = {},
  ) {
    this.now = opts.now ?? (() => performance.now());
  }

  /** True while messages can still reach the client (open socket, not closed for its backlog). */
  get isOpen(): boolean {
    return this.socket.readyState === OPEN && !this.budget.close;
  }

  /** True once the client was over its budget for too long (it is being closed). */
  get overBudget(): boolean {
    return this.budget.close;
  }

  /** Sends a payload (a message as JSON). Never throws: a closing socket just misses it. */
  sendPayload(json: string): void {
    if (!this.isOpen) return;
    try {
      this.socket.send(json);
    } catch {
      // The socket is closing; the heartbeat and close handler clean it up.
    }
    this.checkBudget();
  }

  /** Serialises and sends one message. */
  send(message: { type: string } & Record<string, unknown>): void {
    this.sendPayload(JSON.stringify(message));
  }

  /**
   * Compares the socket's backlog with the budget (also called on a timer, since a client
   * that receives nothing new still holds its backlog); closes the client once it is over.
   */
  checkBudget(): void {
    if (this.budget.close) return;
    this.budget = checkBudget(this.budget, this.socket.bufferedAmount, this.now());
    if (this.budget.close) this.opts.onOverBudget?.();
  }

  /**
   * Sends a batch of readings, thinned to what this socket can take. `seq` is the topic's
   * number of the last reading in `readings`; `shared` is the unthinned payload for clients
   * that keep up and have nothing dropped to report.
   */
  sendBatch(topic: Topic, seq: number, readings: readonly LiveReading[], shared: () => string): void {
    if (!this.isOpen) return;
    const key = topicKey(topic);
    const buffered = this.socket.bufferedAmount;
    this.thinning = nextThinning(this.thinning, buffered);
    const keepEvery = keepEveryFor(buffered, this.thinning);
    const owed = this.dropped.get(key) ?? 0;
    if (keepEvery === 1 && owed === 0) return this.sendPayload(shared());
    const { keep, phase } = thinIndices(readings.length, keepEvery, this.phase.get(key) ?? 0);
    this.phase.set(key, phase);
    const droppedNow = readings.length - keep.length;
    this.droppedTotal += droppedNow;
    if (keep.length === 0) {
      this.dropped.set(key, owed + droppedNow);
      return;
    }
    this.dropped.set(key, 0);
    this.send({ type: 'batch', seq, topic, readings: toReadingColumns(topic.kind, readings, keep), dropped: owed + droppedNow });
  }

  /** Forgets a topic's thinning counters (after an unsubscribe). */
  forgetTopic(key: string): void {
    this.phase.delete(key);
    this.dropped.delete(key);
  }
}
