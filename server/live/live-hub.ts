import { randomBytes } from 'node:crypto';
import type { StoredRunEvent } from '../../shared/schemas/api-runs.js';
import type { BenchStatus } from '../../shared/schemas/bench.js';
import type { AnnotationEvent, RunEvent } from '../../shared/schemas/run-event.js';
import type { Run } from '../../shared/schemas/run.js';
import { topicKey, type ReadingCursor, type SnapshotResume, type Topic } from '../../shared/schemas/ws.js';
import type { ClientSender } from './client-sender.js';
import { toReadingColumns, type LiveReading } from '../readings/reading-columns.js';

/** Batches of one topic go out at most this often. */
export const MIN_BATCH_INTERVAL_MS = 100;
/** Readings a new subscriber's snapshot carries (30 s at 10 Hz). */
export const RECENT_READINGS = 300;
/**
 * Readings kept per topic for clients that reconnect with a cursor (3 min at 10 Hz, longer
 * than the client's longest reconnect wait); an older cursor is told to refetch the history.
 */
export const RESUME_READINGS = 1_800;
/** Random bytes of a topic's stream id: a cursor from before a restart never matches. */
const STREAM_ID_BYTES = 6;
/** Topics one connection may follow at once: a lab's benches and runs, with room to spare. */
export const MAX_SUBSCRIPTIONS_PER_CLIENT = 64;

/** What a snapshot needs that the hub does not hold itself. */
export interface SnapshotSource {
  benchStatus(benchId: number): BenchStatus | null;
  /** The run live on a bench now (armed to recovered), or null when nothing records there. */
  benchRun?(benchId: number): Run | null;
  /** The run (live or archived) and its events; null when there is no such run. */
  run(runId: number): Promise<{ run: Run; events: RunEvent[] } | null>;
}

export interface LiveHubOptions {
  source: SnapshotSource;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (handle: unknown) => void;
}

interface TopicState {
  topic: Topic;
  /** Names this topic's numbering; a new state (restart, topic forgotten) gets a new one. */
  stream: string;
  /** Number of the last reading published (the first is 1). */
  seq: number;
  pending: LiveReading[];
  /** The last readings, oldest first: RESUME_READINGS to twice that (trimmed in steps, not per reading). */
  recent: LiveReading[];
  /** `recent` as ReadingColumns JSON, built once for every snapshot until the next reading. */
  recentJson: string | null;
  lastFlushMs: number;
  timer: unknown;
  subscribers: Set<ClientSender>;
  /** The run finished or was aborted: nothing more will arrive. */
  ended: boolean;
}

/**
 * Fans live data out to WebSocket clients by topic. Readings are gathered per topic and
 * sent at most every MIN_BATCH_INTERVAL_MS (at once when the last batch is older than
 * that, so latency stays low at meter rates); events, run changes and status go out at
 * once. A slow client is thinned by its own sender and never holds up the others.
 */
export class LiveHub {
  private readonly topics = new Map<string, TopicState>();
  private readonly now: () => number;
  private readonly setTimer: (fn: () => void, ms: number) => unknown;
  private readonly clearTimer: (handle: unknown) => void;

  constructor(private readonly opts: LiveHubOptions) {
    this.now = opts.now ?? (() => performance.now());
    this.setTimer = opts.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
    this.clearTimer = opts.clearTimer ?? ((h) => clearTimeout(h as NodeJS.Timeout));
  }

  /**
   * Subscribes a client and sends it the topic's snapshot; an unknown run gets an error.
   * Subscribes still waiting for their data count against the cap, and one that completes
   * after its socket closed (or after an unsubscribe of the same topic) keeps nothing.
   */
  async subscribe(client: ClientSender, topic: Topic, after?: ReadingCursor): Promise<void> {
    const key = topicKey(topic);
    const known = client.subscriptions.has(key) || client.pendingSubscribes.has(key);
    if (!known && client.subscriptions.size + client.pendingSubscribes.size >= MAX_SUBSCRIPTIONS_PER_CLIENT) {
      return client.send({ type: 'error', message: `Too many subscriptions (at most ${MAX_SUBSCRIPTIONS_PER_CLIENT}); unsubscribe from one first`, topic });
    }
    const token = Symbol(key);
    client.pendingSubscribes.set(key, token);
    let found: { run: Run; events: RunEvent[] } | null = null;
    try {
      if (topic.kind === 'run') found = await this.opts.source.run(topic.id);
    } catch (error) {
      if (client.pendingSubscribes.get(key) === token) client.pendingSubscribes.delete(key);
      throw error;
    }
    // Only the newest subscribe of a topic completes it; an unsubscribe or a close cancels it.
    if (client.pendingSubscribes.get(key) !== token) return;
    client.pendingSubscribes.delete(key);
    if (!client.isOpen) return;
    if (topic.kind === 'run' && !found) return client.send({ type: 'error', message: `Run ${topic.id} not found`, topic });
    const state = this.state(topic);
    // Readings still pending go to the other viewers first, so the snapshot is exactly up to `seq`.
    this.flush(state);
    state.subscribers.add(client);
    client.subscriptions.add(key);
    const status = topic.kind === 'bench' ? this.opts.source.benchStatus(topic.id) : null;
    const run = topic.kind === 'bench' ? (this.opts.source.benchRun?.(topic.id) ?? null) : found!.run;
    const resume: SnapshotResume = !after ? 'fresh' : this.missedSince(state, after) ? 'resumed' : 'refetch';
    let recentJson: string;
    if (resume === 'resumed') recentJson = JSON.stringify(toReadingColumns(topic.kind, this.missedSince(state, after!)!));
    else recentJson = state.recentJson ??= JSON.stringify(toReadingColumns(topic.kind, state.recent.slice(-RECENT_READINGS)));
    const head = JSON.stringify({ type: 'snapshot', stream: state.stream, seq: state.seq, resume, topic, status, run });
    client.sendPayload(`${head.slice(0, -1)},"recent":${recentJson},"events":${JSON.stringify(found?.events ?? [])}}`);
  }

  /**
   * The readings after a client's cursor, or null when the cursor is of another stream, ahead
   * of this one, or older than the readings kept (the client must refetch the history).
   */
  private missedSince(state: TopicState, after: ReadingCursor): LiveReading[] | null {
    if (after.stream !== state.stream || after.seq > state.seq) return null;
    const firstKept = state.seq - state.recent.length + 1;
    if (after.seq + 1 < firstKept) return null;
    return state.recent.slice(after.seq + 1 - firstKept);
  }

  /** Stops sending a topic to a client. */
  unsubscribe(client: ClientSender, topic: Topic): void {
    const key = topicKey(topic);
    client.subscriptions.delete(key);
    client.pendingSubscribes.delete(key);
    client.forgetTopic(key);
    this.leave(key, client);
  }

  /** Forgets a disconnected client everywhere. */
  removeClient(client: ClientSender): void {
    for (const key of client.subscriptions) this.leave(key, client);
    client.subscriptions.clear();
    client.pendingSubscribes.clear();
  }

  /** Topics held in memory (for tests and logs). */
  topicCount(): number {
    return this.topics.size;
  }

  /**
   * Drops a client from a topic, and the topic itself once nobody follows it and it holds
   * nothing worth keeping, so subscribing to made-up ids never grows the server's memory.
   */
  private leave(key: string, client: ClientSender): void {
    const state = this.topics.get(key);
    if (!state) return;
    state.subscribers.delete(client);
    if (state.subscribers.size > 0 || (state.recent.length > 0 && !state.ended)) return;
    if (state.timer !== null) this.clearTimer(state.timer);
    this.topics.delete(key);
  }

  /** A bench frame or a run reading arrived. */
  publishReading(topic: Topic, reading: LiveReading): void {
    const state = this.state(topic);
    state.recent.push(reading);
    state.seq++;
    state.recentJson = null;
    if (state.recent.length > 2 * RESUME_READINGS) state.recent.splice(0, state.recent.length - RESUME_READINGS);
    if (state.subscribers.size === 0) return;
    state.pending.push(reading);
    if (state.timer !== null) return;
    const wait = state.lastFlushMs + MIN_BATCH_INTERVAL_MS - this.now();
    if (wait <= 0) this.flush(state);
    else state.timer = this.setTimer(() => this.flush(state), wait);
  }

  /** A run event: sent at once, never thinned. */
  publishEvent(runId: number, event: RunEvent, eventId: number | null): void {
    const topic: Topic = { kind: 'run', id: runId };
    const state = this.topics.get(topicKey(topic));
    if (!state?.subscribers.size) return;
    // Readings before the event go first so a chart never shows an event ahead of its data.
    this.flush(state);
    const json = JSON.stringify({ type: 'event', topic, eventId, event });
    for (const c of state.subscribers) c.sendPayload(json);
  }

  /** A note on a run was edited or removed: every viewer of the run is told (never thinned). */
  publishNoteChange(change: { runId: number; eventId: number; previous: AnnotationEvent; next: AnnotationEvent | null }): void {
    const topic: Topic = { kind: 'run', id: change.runId };
    const state = this.topics.get(topicKey(topic));
    if (!state?.subscribers.size) return;
    const json = JSON.stringify({ type: 'note', topic, eventId: change.eventId, previous: change.previous, event: change.next });
    for (const c of state.subscribers) c.sendPayload(json);
  }

  /** A stored event (annotation) for a run. */
  publishStoredEvent(stored: StoredRunEvent): void {
    this.publishEvent(stored.runId, stored.event, stored.id);
  }

  /**
   * A run started, changed state, name or tags: told to the run's viewers and to its
   * bench's, so a bench page learns of a run started elsewhere without polling. A run that
   * ended drops its reading buffers.
   */
  publishRun(run: Run): void {
    const topic: Topic = { kind: 'run', id: run.id };
    const key = topicKey(topic);
    const state = this.topics.get(key);
    if (state) {
      this.flush(state);
      const json = JSON.stringify({ type: 'run', topic, run });
      for (const c of state.subscribers) c.sendPayload(json);
      state.ended = run.state === 'finished' || run.state === 'aborted';
      if (state.ended && state.subscribers.size === 0) this.topics.delete(key);
    }
    if (run.benchId === null) return;
    const benchTopic: Topic = { kind: 'bench', id: run.benchId };
    const bench = this.topics.get(topicKey(benchTopic));
    if (!bench?.subscribers.size) return;
    const json = JSON.stringify({ type: 'run', topic: benchTopic, run });
    for (const c of bench.subscribers) c.sendPayload(json);
  }

  /** A bench's source status changed. */
  publishStatus(benchId: number, status: BenchStatus): void {
    const topic: Topic = { kind: 'bench', id: benchId };
    const state = this.topics.get(topicKey(topic));
    if (!state?.subscribers.size) return;
    const json = JSON.stringify({ type: 'status', topic, status });
    for (const c of state.subscribers) c.sendPayload(json);
  }

  /** Cancels pending timers (shutdown). */
  close(): void {
    for (const s of this.topics.values()) if (s.timer !== null) this.clearTimer(s.timer);
    this.topics.clear();
  }

  private state(topic: Topic): TopicState {
    const key = topicKey(topic);
    let s = this.topics.get(key);
    if (!s) {
      s = { topic, stream: randomBytes(STREAM_ID_BYTES).toString('hex'), seq: 0, pending: [], recent: [], recentJson: null, lastFlushMs: Number.NEGATIVE_INFINITY, timer: null, subscribers: new Set(), ended: false };
      this.topics.set(key, s);
    }
    return s;
  }

  private flush(state: TopicState): void {
    if (state.timer !== null) this.clearTimer(state.timer);
    state.timer = null;
    if (state.pending.length === 0) return;
    const readings = state.pending;
    state.pending = [];
    state.lastFlushMs = this.now();
    let shared: string | null = null;
    const build = () => (shared ??= JSON.stringify({ type: 'batch', seq: state.seq, topic: state.topic, readings: toReadingColumns(state.topic.kind, readings), dropped: 0 }));
    for (const c of state.subscribers) c.sendBatch(state.topic, state.seq, readings, build);
  }
}
