import type { BenchStatus, SourceState } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { ManagedBench } from '../ingest/bench-manager.js';
import type { Clock, TimerHandle } from '../ingest/clock.js';
import { safeDeliver, type Source, type SourceSink } from '../ingest/sources/source.js';
import { MS_PER_S } from '../../shared/units/time.js';


/** What the stand-in asks of the MQTT link. */
export interface GatewaySourceLink {
  attach(benchId: number, source: GatewaySource): void;
  detach(benchId: number, source: GatewaySource): void;
  /** The gateway's name and whether it is online now (null: not registered or revoked). */
  gateway(gatewayId: number): { name: string; online: boolean } | null;
  /** Whether the server's own connection to the broker is up. */
  readonly connected: boolean;
}

/**
 * The server's stand-in Source for a bench a gateway runs: frames and status come over MQTT
 * (already de-duplicated by the link) and go into the same sink a local source feeds, so
 * runs, alarms, archive and live view treat the bench like a local one. Its status is the
 * gateway's report of the meter, overruled when the gateway or the broker is out of reach,
 * or when no frame came for the bench's no-data time while the meter was said to deliver.
 */
export class GatewaySource implements Source {
  private remote: BenchStatus | null = null;
  private running = false;
  private stale = false;
  private framesOk = 0;
  private lastFrameAtMs: number | undefined;
  private watchdog: TimerHandle | undefined;
  private reported: string | undefined;
  private readonly staleAfterMs: number | undefined;

  constructor(
    private readonly bench: ManagedBench,
    private readonly sink: SourceSink,
    private readonly link: GatewaySourceLink,
    private readonly clock: Clock,
  ) {
    const source = bench.source;
    this.staleAfterMs = source.kind === 'none' ? undefined : source.staleAfterSeconds * MS_PER_S;
  }

  /** The gateway that runs the bench. */
  get gatewayId(): number | null {
    return this.bench.gatewayId ?? null;
  }

  /** Registers with the link. */
  start(): void {
    if (this.running) return;
    this.running = true;
    this.link.attach(this.bench.id, this);
    this.report();
  }

  /** Unregisters; nothing is delivered afterwards. */
  async stop(): Promise<void> {
    if (!this.running) return;
    this.running = false;
    this.disarm();
    this.link.detach(this.bench.id, this);
    this.report();
  }

  /** A frame from the gateway, in order and seen once; dropped once the gateway is revoked. */
  frame(frame: Frame): void {
    // The broker may have taken (and queued for the server) a message just before it read the revocation.
    if (!this.running || !this.gatewayRegistered()) return;
    this.framesOk++;
    this.lastFrameAtMs = this.clock.nowMs();
    this.stale = false;
    this.arm();
    // The gateway's status says receiving before its first frame; a stale stand-in recovers here.
    this.report();
    safeDeliver(this.sink.frame, frame);
  }

  /** The gateway reported a status change of the meter (ignored once the gateway is revoked). */
  remoteStatus(status: BenchStatus): void {
    if (!this.gatewayRegistered()) return;
    this.remote = status;
    if (status.state !== 'receiving') this.disarm();
    this.report();
  }

  /** The gateway came online or went offline, or the server's broker connection changed. */
  reachabilityChanged(): void {
    this.report();
  }

  /** The current status, counts included. */
  getStatus(): BenchStatus {
    const { state, message } = this.stateNow();
    return {
      state,
      ...(message !== undefined && { message }),
      ...(this.lastFrameAtMs !== undefined && { lastFrameAt: new Date(this.lastFrameAtMs).toISOString() }),
      framesOk: this.framesOk,
      framesRejected: this.remote?.framesRejected ?? 0,
      ...(this.remote?.lastRejection !== undefined && { lastRejection: this.remote.lastRejection }),
    };
  }

  private stateNow(): { state: SourceState; message?: string } {
    if (!this.running) return { state: 'idle', message: 'stopped' };
    if (!this.bench.enabled) return { state: 'idle', message: 'bench disabled' };
    const gateway = this.link.gateway(this.bench.gatewayId!);
    if (!gateway) return { state: 'error', message: 'the bench is assigned to a gateway that is not registered' };
    if (!this.link.connected) return { state: 'reconnecting', message: 'no connection to the MQTT broker' };
    if (!gateway.online) return { state: 'reconnecting', message: `gateway ${gateway.name} offline` };
    if (this.stale) return { state: 'stale', message: `no frame from gateway ${gateway.name} for ${Math.round(this.staleAfterMs! / MS_PER_S)} s` };
    if (!this.remote) return { state: 'connected', message: `waiting for gateway ${gateway.name}` };
    return { state: this.remote.state, ...(this.remote.message !== undefined && { message: this.remote.message }) };
  }

  private gatewayRegistered(): boolean {
    return this.gatewayId !== null && this.link.gateway(this.gatewayId) !== null;
  }

  private report(): void {
    const status = this.getStatus();
    const key = `${status.state}|${status.message ?? ''}`;
    if (key === this.reported) return;
    this.reported = key;
    safeDeliver(this.sink.status, status);
  }

  private arm(): void {
    if (this.staleAfterMs === undefined) return;
    this.disarm();
    this.watchdog = this.clock.setTimeout(() => {
      this.watchdog = undefined;
      this.stale = true;
      this.report();
    }, this.staleAfterMs);
  }

  private disarm(): void {
    if (this.watchdog !== undefined) this.clock.clearTimeout(this.watchdog);
    this.watchdog = undefined;
  }
}
