import type { BenchSourceConfig, BenchStatus } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { ListenerSet } from './listener-set.js';
import { createSource, type SourceDeps } from './sources/create-source.js';
import { IdleSource } from './sources/idle-source.js';
import type { Source, SourceSink } from './sources/source.js';
import { createLogger, type Logger } from '../log/logger.js';

/** What the manager needs to know of a bench. */
export interface ManagedBench {
  id: number;
  source: BenchSourceConfig;
  enabled: boolean;
  /** A bench gateway runs the source on another machine (its frames arrive over MQTT); absent or null: run here. */
  gatewayId?: number | null;
}

/** Makes the stand-in source of a bench that a gateway runs (the server's MQTT link). */
export type RemoteSourceFactory = (bench: ManagedBench, sink: SourceSink) => Source;

/** A frame listener: every valid frame of every bench, in order per bench. */
export type FrameListener = (benchId: number, frame: Frame) => void;
/** A step applied to each frame of a bench before it is handed out; returns the frame to hand out. */
export type FrameTransform = (benchId: number, frame: Frame) => Frame;
/** A status listener: state or message changes of any bench. */
export type StatusListener = (benchId: number, status: BenchStatus) => void;

/**
 * The read side of the bench manager: what consumers (run recorder, WebSocket hub) need.
 * Depend on this rather than the class to fake it in tests.
 */
export interface BenchFeed {
  onFrame(listener: FrameListener): () => void;
  onStatus(listener: StatusListener): () => void;
  getStatus(benchId: number): BenchStatus;
}

interface Entry {
  config: string;
  enabled: boolean;
  simulated: boolean;
  source: Source;
}

const UNKNOWN_BENCH: BenchStatus = { state: 'idle', message: 'bench not running', framesOk: 0, framesRejected: 0 };

/**
 * Holds one source per bench and fans their frames and status out to listeners (the
 * run recorder, the WebSocket hub). Sources never throw into it and listeners are
 * isolated from one another, so one faulty consumer never stops ingest.
 */
export class BenchManager implements BenchFeed {
  private readonly entries = new Map<number, Entry>();
  /** Changes to one bench run one after another, so two quick edits never leave two sources on one port. */
  private readonly pending = new Map<number, Promise<unknown>>();
  private readonly frameListeners: ListenerSet<[number, Frame]>;
  private readonly statusListeners: ListenerSet<[number, BenchStatus]>;
  private transform: FrameTransform = (_benchId, frame) => frame;

  constructor(
    private readonly deps: SourceDeps = {},
    private readonly log: Logger = createLogger('ingest'),
    private readonly remoteSource?: RemoteSourceFactory,
  ) {
    this.frameListeners = new ListenerSet((err) => this.log.error('bench frame listener failed', err));
    this.statusListeners = new ListenerSet((err) => this.log.error('bench status listener failed', err));
  }

  /**
   * Sets the one step every frame passes where it is made, before any listener sees it (the
   * meters' calibration); listeners then all get the same frame.
   */
  setFrameTransform(transform: FrameTransform): void {
    this.transform = transform;
  }

  /** Subscribes to frames of all benches; returns the unsubscribe. */
  onFrame(listener: FrameListener): () => void {
    return this.frameListeners.add(listener);
  }

  /** Subscribes to status changes of all benches; returns the unsubscribe. */
  onStatus(listener: StatusListener): () => void {
    return this.statusListeners.add(listener);
  }

  /** The live status of a bench (idle when it is not managed). */
  getStatus(benchId: number): BenchStatus {
    return this.entries.get(benchId)?.source.getStatus() ?? UNKNOWN_BENCH;
  }

  /** Ids of the benches currently managed. */
  benchIds(): number[] {
    return [...this.entries.keys()];
  }

  /** Starts a bench, or restarts it when its source or enabled flag changed; unchanged benches keep running. */
  apply(bench: ManagedBench): Promise<void> {
    return this.serially(bench.id, () => this.applyNow(bench));
  }

  private async applyNow(bench: ManagedBench): Promise<void> {
    const remote = bench.gatewayId ?? null;
    const config = JSON.stringify([bench.source, remote]);
    const current = this.entries.get(bench.id);
    if (current && current.config === config && current.enabled === bench.enabled) return;
    await this.removeNow(bench.id);
    // A gateway's bench gets its stand-in even when disabled: the gateway must hear that too.
    const source = remote !== null
      ? (this.remoteSource?.(bench, this.sinkFor(bench.id)) ?? new IdleSource('bench runs on a gateway, but MQTT is not configured'))
      : bench.enabled
        ? createSource(bench.source, this.sinkFor(bench.id), this.deps)
        : new IdleSource('bench disabled');
    const entry: Entry = { config, enabled: bench.enabled, simulated: remote === null && bench.enabled && bench.source.kind === 'simulator', source };
    this.entries.set(bench.id, entry);
    source.start();
    this.statusListeners.emit(bench.id, source.getStatus());
  }

  /** Makes the managed set match `benches`: starts new ones, reconfigures changed ones, stops the rest. */
  async sync(benches: ManagedBench[]): Promise<void> {
    const keep = new Set(benches.map((b) => b.id));
    for (const id of this.benchIds()) if (!keep.has(id)) await this.remove(id);
    for (const bench of benches) await this.apply(bench);
  }

  /**
   * Puts a fresh simulated pack on a simulated bench: its scenario plays again from the start
   * (full pack, BMS reset). Resolves false, doing nothing, for a bench with a real meter.
   */
  freshSimulation(benchId: number): Promise<boolean> {
    if (!this.entries.get(benchId)?.simulated) return Promise.resolve(false);
    return this.restart(benchId);
  }

  /** Stops a bench's source and closes its port, then restarts it with the same configuration. */
  restart(benchId: number): Promise<boolean> {
    return this.serially(benchId, () => this.restartNow(benchId));
  }

  private async restartNow(benchId: number): Promise<boolean> {
    const entry = this.entries.get(benchId);
    if (!entry) return false;
    await entry.source.stop();
    // Only restart if nobody replaced or removed the bench while it was stopping.
    if (this.entries.get(benchId) === entry) entry.source.start();
    return true;
  }

  /** Stops and forgets a bench. */
  remove(benchId: number): Promise<void> {
    return this.serially(benchId, () => this.removeNow(benchId));
  }

  private async removeNow(benchId: number): Promise<void> {
    const entry = this.entries.get(benchId);
    if (!entry) return;
    this.entries.delete(benchId);
    await entry.source.stop();
    this.statusListeners.emit(benchId, UNKNOWN_BENCH);
  }

  /** Stops every source (server shutdown). */
  async stopAll(): Promise<void> {
    for (const id of this.benchIds()) await this.remove(id);
  }

  private serially<T>(benchId: number, job: () => Promise<T>): Promise<T> {
    const previous = this.pending.get(benchId) ?? Promise.resolve();
    const next = previous.then(job, job);
    const settled = next.catch(() => undefined);
    this.pending.set(benchId, settled);
    void settled.then(() => {
      if (this.pending.get(benchId) === settled) this.pending.delete(benchId);
    });
    return next;
  }

  private sinkFor(benchId: number) {
    return {
      frame: (frame: Frame) => {
        if (this.entries.has(benchId)) this.frameListeners.emit(benchId, this.transform(benchId, frame));
      },
      status: (status: BenchStatus) => this.statusListeners.emit(benchId, status),
    };
  }
}
