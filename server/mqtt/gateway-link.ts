import { connect, type MqttClient } from 'mqtt';
import { FeedMessageSchema, GatewayStateMessageSchema, type GatewayConfigMessage } from '../../shared/schemas/gateway.js';
import type { Clock } from '../ingest/clock.js';
import { gatewayConfigTopic, parseTopic, SERVER_SUBSCRIPTIONS, SERVER_USERNAME } from './topics.js';
import type { FeedSeqStore } from './feed-seq-store.js';
import type { GatewaySource, GatewaySourceLink } from './gateway-source.js';
import type { Logger } from '../log/logger.js';

/** The server's MQTT client id: one server per broker (several would share a subscription, see docs/scale-out.md). */
export const SERVER_CLIENT_ID = 'kneepoint-server';
/** The broker keeps the server's session (and queues for it) this long while it is away. */
export const SERVER_SESSION_EXPIRY_S = 7 * 24 * 3600;
const RECONNECT_MS = 1000;
/** Start-up waits at most this long for the broker before going on (the link keeps trying). */
const FIRST_CONNECT_WAIT_MS = 5000;
/** Configuration changes within this time go out as one message. */
const CONFIG_DEBOUNCE_MS = 50;
/** The last taken `seq` of each bench is saved at least this often (and when the link stops). */
export const SEQ_SAVE_INTERVAL_MS = 1000;

/** A registered gateway as the link knows it. */
export interface KnownGateway {
  id: number;
  name: string;
}

/** What the board shows of a gateway. */
export interface GatewayLiveState {
  online: boolean;
  lastSeenMs: number | null;
  clockOffsetMs: number | null;
  outboxDepth: number | null;
}

/** How the link reaches the broker and the database. */
export interface GatewayLinkOptions {
  url: string;
  username?: string;
  password?: string;
  clock: Clock;
  log: Logger;
  /** The registered, not revoked gateways. */
  loadGateways: () => Promise<KnownGateway[]>;
  /** What a gateway should run. */
  configFor: (gatewayId: number) => Promise<GatewayConfigMessage>;
  /** Keeps the last taken `seq` per bench across restarts (default: memory only). */
  seqStore?: FeedSeqStore;
}

/** Counters of what the link dropped, for logs and the benchmark. */
export interface LinkCounters {
  accepted: number;
  duplicates: number;
  /** Messages that jumped over sequence numbers (never expected: the gateway's outbox loses nothing). */
  gaps: number;
  invalid: number;
}

/**
 * The server's side of the bench gateways: one MQTT client (QoS 1, persistent session) that
 * takes every bench feed and gateway state, drops QoS 1 redeliveries by each bench's
 * sequence number, and hands frames and status to the bench's stand-in source. It also
 * publishes each gateway's configuration (retained) when its benches change.
 */
export class GatewayLink implements GatewaySourceLink {
  private client: MqttClient | undefined;
  private readonly sources = new Map<number, GatewaySource>();
  private readonly lastSeq = new Map<number, number>();
  private known = new Map<number, KnownGateway>();
  private readonly states = new Map<string, GatewayLiveState>();
  private readonly configTimers = new Map<number, NodeJS.Timeout>();
  /** Benches whose last taken `seq` changed since the last save. */
  private readonly unsaved = new Set<number>();
  private saveTimer: NodeJS.Timeout | undefined;
  private saving: Promise<void> = Promise.resolve();
  readonly counters: LinkCounters = { accepted: 0, duplicates: 0, gaps: 0, invalid: 0 };

  constructor(private readonly options: GatewayLinkOptions) {}

  /** Whether the server's connection to the broker is up. */
  get connected(): boolean {
    return this.client?.connected ?? false;
  }

  /** Loads the gateways and connects; resolves on the first connection or after a short wait (it keeps trying). */
  async start(): Promise<void> {
    await this.prepare();
    await this.connect();
  }

  /** Loads the gateways and the last taken `seq`s, without connecting yet. */
  async prepare(): Promise<void> {
    await this.refresh();
    // Before the first message: a redelivery of what the previous process took is dropped, not recorded twice.
    for (const [benchId, seq] of (await this.options.seqStore?.load()) ?? []) this.lastSeq.set(benchId, seq);
    if (this.options.seqStore) {
      this.saveTimer = setInterval(() => void this.saveSeqs(), SEQ_SAVE_INTERVAL_MS);
      this.saveTimer.unref();
    }
  }

  /**
   * Connects; resolves on the first connection or after a short wait (it keeps trying). The
   * broker hands over what it queued for the server's session at once, so whatever takes
   * the frames (bench stand-ins, the run recorder) must be in place before this is called.
   */
  async connect(): Promise<void> {
    if (this.client) return;
    const client = connect(this.options.url, {
      clientId: SERVER_CLIENT_ID,
      username: this.options.username ?? SERVER_USERNAME,
      ...(this.options.password !== undefined && { password: this.options.password }),
      clean: false,
      protocolVersion: 5,
      properties: { sessionExpiryInterval: SERVER_SESSION_EXPIRY_S },
      reconnectPeriod: RECONNECT_MS,
    });
    this.client = client;
    const first = new Promise<void>((resolve) => {
      client.once('connect', () => resolve());
      setTimeout(resolve, FIRST_CONNECT_WAIT_MS).unref();
    });
    client.on('connect', () => {
      this.options.log.info('connected to the broker');
      client.subscribe(SERVER_SUBSCRIPTIONS, { qos: 1 });
      for (const id of this.known.keys()) this.scheduleConfig(id);
      this.notifyAll();
    });
    client.on('close', () => this.notifyAll());
    client.on('error', (err) => this.options.log.error('broker connection error', err));
    client.on('message', (topic, payload) => this.onMessage(topic, payload));
    await first;
  }

  /** Reloads the registered gateways (after a registration, revocation or assignment). */
  async refresh(): Promise<void> {
    this.known = new Map((await this.options.loadGateways()).map((g) => [g.id, g]));
    this.notifyAll();
  }

  /** A gateway's name and reachability, for its benches' stand-ins. */
  gateway(gatewayId: number): { name: string; online: boolean } | null {
    const g = this.known.get(gatewayId);
    return g ? { name: g.name, online: this.states.get(g.name)?.online ?? false } : null;
  }

  /** What the board shows of a gateway. */
  liveState(name: string): GatewayLiveState {
    return this.states.get(name) ?? { online: false, lastSeenMs: null, clockOffsetMs: null, outboxDepth: null };
  }

  /** A bench's stand-in starts listening. */
  attach(benchId: number, source: GatewaySource): void {
    this.sources.set(benchId, source);
    if (source.gatewayId !== null) this.scheduleConfig(source.gatewayId);
  }

  /** A bench's stand-in stops. */
  detach(benchId: number, source: GatewaySource): void {
    if (this.sources.get(benchId) === source) this.sources.delete(benchId);
    if (source.gatewayId !== null) this.scheduleConfig(source.gatewayId);
  }

  /** Publishes a gateway's configuration soon (changes close together go out once). */
  scheduleConfig(gatewayId: number): void {
    clearTimeout(this.configTimers.get(gatewayId));
    this.configTimers.set(
      gatewayId,
      setTimeout(() => {
        this.configTimers.delete(gatewayId);
        void this.publishConfig(gatewayId).catch((err: unknown) => this.options.log.error(`configuration of gateway ${gatewayId} not sent`, err));
      }, CONFIG_DEBOUNCE_MS),
    );
  }

  /** Publishes a gateway's configuration now (a pending debounced one is dropped: this one is newer). */
  async publishConfigNow(gatewayId: number): Promise<void> {
    clearTimeout(this.configTimers.get(gatewayId));
    this.configTimers.delete(gatewayId);
    await this.publishConfig(gatewayId);
  }

  private async publishConfig(gatewayId: number): Promise<void> {
    const gateway = this.known.get(gatewayId);
    if (!gateway || !this.client?.connected) return;
    const config = await this.options.configFor(gatewayId);
    await this.client.publishAsync(gatewayConfigTopic(gateway.name), JSON.stringify(config), { qos: 1, retain: true });
  }

  private onMessage(topic: string, payload: Buffer): void {
    const where = parseTopic(topic);
    if (!where) return;
    let raw: unknown;
    try {
      raw = JSON.parse(payload.toString('utf8'));
    } catch {
      this.counters.invalid++;
      return;
    }
    if (where.kind === 'state') return this.onState(where.gateway, raw);
    const parsed = FeedMessageSchema.safeParse(raw);
    if (!parsed.success) {
      this.counters.invalid++;
      if (this.counters.invalid === 1) this.options.log.warn(`a message on bench ${where.benchId}'s feed was refused: ${parsed.error.issues[0]?.message ?? '?'}`);
      return;
    }
    const message = parsed.data;
    const last = this.lastSeq.get(where.benchId);
    // seq 1 is a gateway starting with a new, empty outbox: take it and count on from there.
    if (last !== undefined && message.seq <= last && message.seq !== 1) {
      this.counters.duplicates++;
      return;
    }
    if (last !== undefined && message.seq > last + 1) {
      this.counters.gaps++;
      this.options.log.warn(`bench ${where.benchId}: sequence jumped from ${last} to ${message.seq}`);
    }
    this.lastSeq.set(where.benchId, message.seq);
    this.unsaved.add(where.benchId);
    this.counters.accepted++;
    const source = this.sources.get(where.benchId);
    if (!source) return;
    if (message.type === 'frame') source.frame(message.frame);
    else source.remoteStatus(message.status);
  }

  private onState(name: string, raw: unknown): void {
    const parsed = GatewayStateMessageSchema.safeParse(raw);
    if (!parsed.success) return void this.counters.invalid++;
    const now = this.options.clock.nowMs();
    const previous = this.liveState(name);
    const state = parsed.data;
    this.states.set(name, {
      online: state.online,
      lastSeenMs: state.online ? now : previous.lastSeenMs,
      clockOffsetMs: state.atMs !== undefined && state.online ? state.atMs - now : previous.clockOffsetMs,
      outboxDepth: state.outboxDepth ?? previous.outboxDepth,
    });
    if (previous.online !== state.online) {
      this.options.log.info(`gateway ${name} ${state.online ? 'online' : 'offline'}`);
      this.notifyAll();
    }
  }

  private notifyAll(): void {
    for (const source of this.sources.values()) source.reachabilityChanged();
  }

  /** Saves the benches' last taken `seq` that changed (one save at a time; a failed one is tried again later). */
  saveSeqs(): Promise<void> {
    const store = this.options.seqStore;
    if (!store) return this.saving;
    this.saving = this.saving.then(async () => {
      if (this.unsaved.size === 0) return;
      const batch = new Map([...this.unsaved].map((benchId) => [benchId, this.lastSeq.get(benchId)!]));
      this.unsaved.clear();
      try {
        await store.save(batch);
      } catch (err) {
        for (const benchId of batch.keys()) this.unsaved.add(benchId);
        this.options.log.warn("last feed seq not saved", err);
      }
    });
    return this.saving;
  }

  /** Disconnects (the broker keeps the session and queues for the next start), then saves the last taken `seq`s. */
  async stop(): Promise<void> {
    for (const timer of this.configTimers.values()) clearTimeout(timer);
    this.configTimers.clear();
    clearInterval(this.saveTimer);
    this.saveTimer = undefined;
    await this.client?.endAsync();
    this.client = undefined;
    await this.saveSeqs();
  }
}
