import type { BenchStatus, SerialSourceConfig } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { systemClock, type Clock, type TimerHandle } from '../clock.js';
import { frameRejection } from '../frame-limits.js';
import { StatusTracker } from '../status-tracker.js';
import { startLineSession } from './line-session.js';
import { startModbusSession } from './modbus-session.js';
import type { PortSession, SessionContext } from './port-session.js';
import { startScpiSession } from './scpi-session.js';
import { openRealPort, type PortFactory, type SerialPortLike } from './serial-port-factory.js';
import { safeDeliver, type Source, type SourceSink } from './source.js';
import { MS_PER_S } from '../../../shared/units/time.js';

/** Waits between reopen attempts after an unplug or a failed open; the last one repeats. */
export const RECONNECT_DELAYS_MS = [250, 500, 1000, 2000, 5000, 10_000] as const;
/**
 * A port that stays stale this many watchdog periods is closed and reopened: a USB reset
 * can leave a port open but dead, and only a reopen brings it back.
 */
export const STALE_PERIODS_BEFORE_REOPEN = 2;

/** What a serial source needs from outside; tests pass a manual clock and the mock binding. */
export interface SerialSourceDeps {
  clock?: Clock;
  openPort?: PortFactory;
  reconnectDelaysMs?: readonly number[];
}

/**
 * A meter on a serial port (or a pseudo-terminal). Opens the port, runs the protocol
 * session for the configured format, and on an unplug, error or close reopens it with
 * growing back-off, for as long as it is not stopped. The back-off resets once a valid
 * frame arrives (not merely on open: a port that opens and dies at once must not spin).
 */
export class SerialSource implements Source {
  private readonly clock: Clock;
  private readonly openPort: PortFactory;
  private readonly delaysMs: readonly number[];
  private readonly tracker: StatusTracker;
  private port: SerialPortLike | undefined;
  private session: PortSession | undefined;
  private retryTimer: TimerHandle | undefined;
  private reopenTimer: TimerHandle | undefined;
  private opening: { port: SerialPortLike; done: Promise<void> } | undefined;
  private attempt = 0;
  private running = false;

  constructor(
    private readonly config: SerialSourceConfig,
    private readonly sink: SourceSink,
    deps: SerialSourceDeps = {},
  ) {
    this.clock = deps.clock ?? systemClock;
    this.openPort = deps.openPort ?? openRealPort;
    this.delaysMs = deps.reconnectDelaysMs ?? RECONNECT_DELAYS_MS;
    const staleAfterMs = config.staleAfterSeconds * MS_PER_S;
    this.tracker = new StatusTracker(this.clock, staleAfterMs, (s) => safeDeliver(sink.status, s), () =>
      this.scheduleStaleReopen(staleAfterMs * STALE_PERIODS_BEFORE_REOPEN),
    );
  }

  /** Opens the port in the background. */
  start(): void {
    if (this.running) return;
    this.running = true;
    this.open();
  }

  /** Closes the port and cancels any pending reopen. */
  async stop(): Promise<void> {
    this.running = false;
    if (this.retryTimer !== undefined) this.clock.clearTimeout(this.retryTimer);
    this.retryTimer = undefined;
    await this.release();
    this.tracker.idle();
  }

  /** Current status with counts. */
  getStatus(): BenchStatus {
    return this.tracker.snapshot();
  }

  private open(): void {
    this.retryTimer = undefined;
    if (!this.running) return;
    let port: SerialPortLike;
    try {
      port = this.openPort(this.portOptions());
    } catch (err) {
      this.retry(describe(err));
      return;
    }
    this.port = port;
    // Listeners go on before open: a port can fail between open and the first read.
    port.on('error', (err: Error) => this.lost(port, describe(err)));
    port.on('close', () => this.lost(port, 'port closed (unplugged?)'));
    const opening = new Promise<void>((settled) =>
      port.open((err) => {
        settled();
        // Released while opening: release() waits for this and closes the port itself.
        if (this.port !== port) return;
        if (err) return this.lost(port, describe(err));
        this.tracker.connected(`${this.config.path} open`);
        this.session = this.startSession(port);
      }),
    );
    this.opening = { port, done: opening };
  }

  private startSession(port: SerialPortLike): PortSession {
    const ctx: SessionContext = {
      port,
      clock: this.clock,
      tracker: this.tracker,
      emitFrame: (frame: Frame) => {
        if (this.port !== port || !this.running) return;
        this.attempt = 0;
        const outside = frameRejection(frame, this.config.limits);
        if (outside) return this.tracker.rejected(outside);
        this.tracker.frameOk();
        safeDeliver(this.sink.frame, frame);
      },
    };
    const { format } = this.config;
    if (format.kind === 'scpi') return startScpiSession(ctx, format);
    if (format.kind === 'modbus') return startModbusSession(ctx, format);
    return startLineSession(ctx, format);
  }

  private scheduleStaleReopen(delayMs: number): void {
    const port = this.port;
    if (!port || this.reopenTimer !== undefined) return;
    this.reopenTimer = this.clock.setTimeout(() => {
      this.reopenTimer = undefined;
      if (this.port === port && this.tracker.currentState === 'stale') this.lost(port, 'no valid frame for a long while: reopening the port');
    }, delayMs);
  }

  /** The port failed or closed: drop it and schedule a reopen (once per port). */
  private lost(port: SerialPortLike, reason: string): void {
    if (this.port !== port) return;
    void this.release();
    if (this.running) this.retry(reason);
  }

  private retry(reason: string): void {
    const delayMs = this.delaysMs[Math.min(this.attempt, this.delaysMs.length - 1)]!;
    this.attempt++;
    this.tracker.reconnecting(`${reason}; retrying in ${(delayMs / MS_PER_S).toFixed(delayMs < MS_PER_S ? 2 : 0)} s`);
    this.retryTimer = this.clock.setTimeout(() => this.open(), delayMs);
  }

  private async release(): Promise<void> {
    if (this.reopenTimer !== undefined) this.clock.clearTimeout(this.reopenTimer);
    this.reopenTimer = undefined;
    this.session?.stop();
    this.session = undefined;
    const port = this.port;
    this.port = undefined;
    if (!port) return;
    port.removeAllListeners('data');
    // Keep an error listener: a late error on a dropped port must not crash the process.
    port.removeAllListeners('error');
    port.on('error', () => undefined);
    // A port still opening is closed once its open completes, so it never keeps the device locked.
    const opening = this.opening?.port === port ? this.opening : undefined;
    if (opening) {
      this.opening = undefined;
      await opening.done;
    }
    if (!port.isOpen) return;
    await new Promise<void>((resolve) => port.close(() => resolve()));
  }

  private portOptions() {
    const { path, baudRate, dataBits, parity, stopBits } = this.config;
    return { path, baudRate, dataBits, parity, stopBits };
  }
}

function describe(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}
