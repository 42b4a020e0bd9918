import { mkdirSync, readFileSync, existsSync, writeFileSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { connect, type MqttClient } from 'mqtt';
import { GatewayConfigMessageSchema, type GatewayConfigMessage, type GatewayStateMessage } from '../../shared/schemas/gateway.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { BenchManager } from '../ingest/bench-manager.js';
import type { SourceDeps } from '../ingest/sources/create-source.js';
import { benchFeedTopic, gatewayConfigTopic, gatewayStateTopic, gatewayUsername } from '../mqtt/topics.js';
import { Outbox } from './outbox.js';
import { createLogger, type Logger } from '../log/logger.js';

/** Messages sent but not yet acknowledged, at most (the rest wait in the outbox). */
export const SEND_WINDOW = 1000;
/** The gateway reports its state (clock, outbox depth) this often. */
export const STATE_EVERY_MS = 2000;
/** Wait between reconnection attempts to the broker. */
export const RECONNECT_MS = 1000;
/** The broker keeps the gateway's session (its subscription and unacknowledged messages) this long while it is away. */
export const SESSION_EXPIRY_S = 7 * 24 * 3600;
/** MQTT 5 reason code of a publish the broker's ACL refused. */
const NOT_AUTHORIZED = 0x87;
const DRAIN_POLL_MS = 50;
/** On SIGTERM the gateway waits this long for the broker to take its outbox before it exits (the rest is kept on disk). */
export const SHUTDOWN_DRAIN_MS = 2000;

/** How to start a gateway. */
export interface GatewayOptions {
  brokerUrl: string;
  name: string;
  password: string;
  /** Folder for the outbox and the last configuration received. */
  dir: string;
  log?: Logger;
  sourceDeps?: SourceDeps;
}

/**
 * Gateway mode: runs only the bench sources assigned to this gateway (the configuration the
 * server publishes, kept on disk for a start without the broker) and publishes each bench's
 * frames and status changes through the on-disk outbox to the broker: QoS 1, a persistent
 * session, its own topics, and a last will that marks it offline.
 */
export class GatewayRuntime {
  private readonly outbox: Outbox;
  private readonly manager: BenchManager;
  private readonly log: Logger;
  private client: MqttClient | undefined;
  private inflight = 0;
  /** Absolute outbox index of the next entry to hand to the client. */
  private next = 0;
  private refused = 0;
  private stateTimer: NodeJS.Timeout | undefined;
  private benchIds: number[] = [];
  private readonly configPath: string;

  constructor(private readonly options: GatewayOptions) {
    this.log = options.log ?? createLogger('gateway');
    mkdirSync(options.dir, { recursive: true });
    this.configPath = join(options.dir, 'config.json');
    this.outbox = new Outbox(options.dir, this.log);
    this.manager = new BenchManager(options.sourceDeps ?? {}, createLogger('ingest', this.log));
    // Everything goes to disk first, then out as the send window allows.
    this.manager.onFrame((benchId, frame) => {
      this.outbox.append(benchId, { type: 'frame', atMs: Date.now(), frame });
      this.pump();
    });
    this.manager.onStatus((benchId, status) => {
      this.outbox.append(benchId, { type: 'status', atMs: Date.now(), status });
      this.pump();
    });
  }

  /** Messages waiting for the broker's acknowledgement. */
  get outboxDepth(): number {
    return this.outbox.depth;
  }

  /** Observes every frame the gateway's benches capture, as it goes into the outbox (logs, the benchmark). */
  onFrame(listener: (benchId: number, frame: Frame) => void): () => void {
    return this.manager.onFrame(listener);
  }

  /** Publishes refused by the broker (a bench no longer assigned to this gateway). */
  get refusedCount(): number {
    return this.refused;
  }

  /** Starts the benches from the last configuration kept on disk, then connects to the broker. */
  async start(): Promise<void> {
    if (existsSync(this.configPath)) {
      const kept = GatewayConfigMessageSchema.safeParse(JSON.parse(readFileSync(this.configPath, 'utf8')));
      if (kept.success) await this.apply(kept.data);
    }
    const { name } = this.options;
    const will: GatewayStateMessage = { online: false };
    const client = connect(this.options.brokerUrl, {
      clientId: gatewayUsername(name),
      username: gatewayUsername(name),
      password: this.options.password,
      clean: false,
      protocolVersion: 5,
      properties: { sessionExpiryInterval: SESSION_EXPIRY_S },
      reconnectPeriod: RECONNECT_MS,
      will: { topic: gatewayStateTopic(name), payload: Buffer.from(JSON.stringify(will)), qos: 1, retain: true },
    });
    this.client = client;
    client.on('connect', () => {
      this.log.info(`gateway ${name}: connected to ${this.options.brokerUrl}`);
      client.subscribe(gatewayConfigTopic(name), { qos: 1 });
      this.publishState();
      this.pump();
    });
    client.on('message', (_topic, payload) => void this.onConfig(payload));
    client.on('error', (err) => this.log.error(`gateway ${name}: broker connection error`, err));
    client.on('offline', () => this.log.warn(`gateway ${name}: broker unreachable; keeping readings in the outbox`));
    this.stateTimer = setInterval(() => this.publishState(), STATE_EVERY_MS);
    this.stateTimer.unref();
  }

  private async onConfig(payload: Buffer): Promise<void> {
    let config: GatewayConfigMessage;
    try {
      config = GatewayConfigMessageSchema.parse(JSON.parse(payload.toString('utf8')));
    } catch (err) {
      this.log.error('configuration refused', err);
      return;
    }
    writeFileSync(`${this.configPath}.tmp`, JSON.stringify(config));
    renameSync(`${this.configPath}.tmp`, this.configPath);
    await this.apply(config);
    this.publishState();
  }

  private async apply(config: GatewayConfigMessage): Promise<void> {
    this.benchIds = config.benches.map((b) => b.id);
    await this.manager.sync(config.benches);
  }

  /** Sends what the outbox holds beyond the window in flight, oldest first, while connected. */
  private pump(): void {
    const client = this.client;
    if (!client?.connected) return;
    while (this.inflight < SEND_WINDOW) {
      this.next = Math.max(this.next, this.outbox.firstUnacknowledged);
      const entry = this.outbox.at(this.next);
      if (!entry) return;
      this.next++;
      this.inflight++;
      client.publish(benchFeedTopic(entry.benchId), JSON.stringify(entry.message), { qos: 1 }, (err) => {
        const code = (err as { code?: number } | undefined)?.code;
        if (err && code !== NOT_AUTHORIZED) return; // still in the client's session store: sent again on reconnect
        if (code === NOT_AUTHORIZED) this.refused++;
        this.inflight--;
        this.outbox.acknowledge(entry);
        this.pump();
      });
    }
  }

  private publishState(): void {
    if (!this.client?.connected) return;
    const state: GatewayStateMessage = { online: true, atMs: Date.now(), outboxDepth: this.outbox.depth, benchIds: this.benchIds };
    this.client.publish(gatewayStateTopic(this.options.name), JSON.stringify(state), { qos: 1, retain: true });
  }

  /**
   * Stops the benches, waits up to `drainMs` for the broker to acknowledge what the outbox
   * holds, says offline, disconnects and closes the outbox (what is unsent stays for the next start).
   */
  async stop(drainMs = 0): Promise<void> {
    clearInterval(this.stateTimer);
    await this.manager.stopAll();
    const until = Date.now() + drainMs;
    while (this.outbox.depth > 0 && this.client?.connected && Date.now() < until) await new Promise((r) => setTimeout(r, DRAIN_POLL_MS));
    const client = this.client;
    if (client?.connected) {
      const offline: GatewayStateMessage = { online: false, atMs: Date.now(), outboxDepth: this.outbox.depth, benchIds: this.benchIds };
      await client.publishAsync(gatewayStateTopic(this.options.name), JSON.stringify(offline), { qos: 1, retain: true }).catch(() => undefined);
    }
    await client?.endAsync();
    this.outbox.close();
  }
}
