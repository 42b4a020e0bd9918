import {
  ServerMessageSchema,
  topicKey,
  type ClientMessage,
  type ReadingCursor,
  type ServerMessage,
  type Topic,
} from '../../shared/schemas/ws';

/** Waits between reconnect attempts; the last one repeats until the server answers. */
export const RECONNECT_DELAYS_MS = [500, 1_000, 2_000, 5_000, 10_000] as const;

export type SocketState = 'connecting' | 'open' | 'closed';
export type MessageListener = (message: ServerMessage) => void;

/** What the socket needs from the outside world; tests pass fakes. */
export interface LiveSocketDeps {
  url: string;
  createSocket: (url: string) => WebSocket;
  setTimer: (fn: () => void, ms: number) => unknown;
  clearTimer: (handle: unknown) => void;
}

interface TopicEntry {
  topic: Topic;
  listeners: Set<MessageListener>;
  /** The last reading this topic's listeners received (from snapshots and batches); null before the first snapshot. */
  cursor: ReadingCursor | null;
}

/** `WebSocket.OPEN`, written out so that the socket works with any WebSocket implementation. */
const OPEN = 1;

/**
 * One WebSocket to /ws shared by every live screen. Screens subscribe to topics; the socket
 * reconnects with back-off and subscribes again with each topic's cursor, and the server
 * answers with a snapshot of exactly the readings missed (or, when the cursor is too old,
 * tells the screen to refetch its history), so no reading is lost or repeated.
 */
export class LiveSocket {
  private ws: WebSocket | null = null;
  private attempt = 0;
  private timer: unknown = null;
  private readonly topics = new Map<string, TopicEntry>();
  private readonly globalListeners = new Set<MessageListener>();
  private readonly stateListeners = new Set<(state: SocketState) => void>();
  private stateValue: SocketState = 'closed';
  /** Server clock minus this browser's clock, from the last hello (ms). */
  clockOffsetMs = 0;

  constructor(private readonly deps: LiveSocketDeps) {}

  /** Connection state, for the "live / reconnecting" badge. */
  get state(): SocketState {
    return this.stateValue;
  }

  /** Listens to one topic; returns the function that stops listening. */
  subscribe(topic: Topic, listener: MessageListener): () => void {
    const key = topicKey(topic);
    let entry = this.topics.get(key);
    if (!entry) {
      entry = { topic, listeners: new Set(), cursor: null };
      this.topics.set(key, entry);
      this.send({ type: 'subscribe', topic });
    }
    entry.listeners.add(listener);
    this.ensureConnected();
    return () => {
      const current = this.topics.get(key);
      if (!current) return;
      current.listeners.delete(listener);
      if (current.listeners.size === 0) {
        this.topics.delete(key);
        this.send({ type: 'unsubscribe', topic });
      }
    };
  }

  /** Listens to messages without a topic (hello, errors, pongs). */
  onMessage(listener: MessageListener): () => void {
    this.globalListeners.add(listener);
    return () => this.globalListeners.delete(listener);
  }

  /** Listens to connection state changes. */
  onState(listener: (state: SocketState) => void): () => void {
    this.stateListeners.add(listener);
    return () => this.stateListeners.delete(listener);
  }

  /** Closes the socket for good (sign-out, tests). */
  close(): void {
    this.topics.clear();
    if (this.timer !== null) this.deps.clearTimer(this.timer);
    this.timer = null;
    this.ws?.close();
    this.ws = null;
    this.setState('closed');
  }

  private setState(state: SocketState): void {
    this.stateValue = state;
    this.stateListeners.forEach((l) => l(state));
  }

  private send(message: ClientMessage): void {
    if (this.ws && this.ws.readyState === OPEN) this.ws.send(JSON.stringify(message));
  }

  private ensureConnected(): void {
    if (this.ws || this.timer !== null) return;
    this.connect();
  }

  private connect(): void {
    this.setState('connecting');
    const ws = this.deps.createSocket(this.deps.url);
    this.ws = ws;
    ws.onopen = () => {
      this.attempt = 0;
      this.setState('open');
      for (const { topic, cursor } of this.topics.values()) this.send(cursor ? { type: 'subscribe', topic, after: cursor } : { type: 'subscribe', topic });
    };
    ws.onmessage = (e: MessageEvent) => this.dispatch(e.data);
    ws.onclose = () => {
      if (this.ws !== ws) return;
      this.ws = null;
      this.setState('closed');
      if (this.topics.size > 0) this.scheduleReconnect();
    };
  }

  private scheduleReconnect(): void {
    const delay = RECONNECT_DELAYS_MS[Math.min(this.attempt, RECONNECT_DELAYS_MS.length - 1)];
    this.attempt++;
    this.timer = this.deps.setTimer(() => {
      this.timer = null;
      if (this.topics.size > 0) this.connect();
    }, delay);
  }

  private dispatch(data: unknown): void {
    if (typeof data !== 'string') return;
    let raw: unknown;
    try {
      raw = JSON.parse(data);
    } catch {
      return; // A garbled frame is ignored; the next batch carries on.
    }
    const parsed = ServerMessageSchema.safeParse(raw);
    if (!parsed.success) return;
    const message = parsed.data;
    if (message.type === 'hello') this.clockOffsetMs = message.serverTimeMs - Date.now();
    const topic = 'topic' in message ? message.topic : undefined;
    if (!topic) {
      this.globalListeners.forEach((l) => l(message));
      return;
    }
    const entry = this.topics.get(topicKey(topic));
    if (!entry) return;
    if (message.type === 'snapshot') entry.cursor = { stream: message.stream, seq: message.seq };
    else if (message.type === 'batch' && entry.cursor) entry.cursor = { stream: entry.cursor.stream, seq: message.seq };
    entry.listeners.forEach((l) => l(message));
  }
}

let shared: LiveSocket | null = null;

/** The app's one live socket, created on first use. */
export function getLiveSocket(): LiveSocket {
  if (!shared) {
    const scheme = location.protocol === 'https:' ? 'wss' : 'ws';
    shared = new LiveSocket({
      url: `${scheme}://${location.host}/ws`,
      createSocket: (url) => new WebSocket(url),
      setTimer: (fn, ms) => setTimeout(fn, ms),
      clearTimer: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
    });
  }
  return shared;
}
