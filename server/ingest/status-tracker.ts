import type { BenchStatus, SourceState } from '../../shared/schemas/bench.js';
import type { Clock, TimerHandle } from './clock.js';
import { MS_PER_S } from '../../shared/units/time.js';


/**
 * Keeps one source's status: its state, frame counts and the no-data watchdog. It calls
 * `onChange` when the state or message changes (not on every frame: counts are read
 * with `snapshot()`), and never lets a listener's exception escape.
 */
export class StatusTracker {
  private state: SourceState = 'idle';
  private message: string | undefined;
  private lastFrameAtMs: number | undefined;
  private framesOk = 0;
  private framesRejected = 0;
  private lastRejection: string | undefined;
  private watchdog: TimerHandle | undefined;
  /** When the watchdog's count last restarted (the port opened, or a valid frame came). */
  private watchFromMs = 0;

  constructor(
    private readonly clock: Clock,
    private readonly staleAfterMs: number | undefined,
    private readonly onChange: (status: BenchStatus) => void,
    /** Called when the watchdog fires (the serial source may reopen the port later). */
    private readonly onStale: () => void = () => undefined,
  ) {}

  /** The port (or simulation) is open; the watchdog starts counting. */
  connected(message?: string): void {
    this.set('connected', message);
    this.disarmWatchdog();
    this.watchFromMs = this.clock.nowMs();
    this.armWatchdog(this.staleAfterMs);
  }

  /** A valid frame went through: counts it, clears a stale state and re-arms the watchdog. */
  frameOk(): void {
    this.framesOk++;
    const now = this.clock.nowMs();
    this.lastFrameAtMs = now;
    this.watchFromMs = now;
    // Keep an informative message (the instrument's identity) but not a stale warning.
    if (this.state !== 'receiving') this.set('receiving', this.state === 'stale' ? undefined : this.message);
    // The armed timer stays: when it fires it looks at watchFromMs and waits out the rest
    // (a timer cancelled and set again for every frame would cost more than the frame itself).
    if (this.watchdog === undefined) this.armWatchdog(this.staleAfterMs);
  }

  /** A line or reply was refused; counted with its reason, the source carries on. */
  rejected(reason: string): void {
    this.framesRejected++;
    this.lastRejection = reason;
  }

  /** The port was lost; a reopen is scheduled. */
  reconnecting(message: string): void {
    this.disarmWatchdog();
    this.set('reconnecting', message);
  }

  /** A fault that needs a person (bad configuration, unknown scenario). */
  error(message: string): void {
    this.disarmWatchdog();
    this.set('error', message);
  }

  /** Stopped on purpose. */
  idle(message?: string): void {
    this.disarmWatchdog();
    this.set('idle', message);
  }

  /** Replaces the message without changing the state (e.g. the instrument's identity). */
  note(message: string): void {
    this.set(this.state, message);
  }

  /** The current state alone. */
  get currentState(): SourceState {
    return this.state;
  }

  /** The current status, counts included. */
  snapshot(): BenchStatus {
    return {
      state: this.state,
      ...(this.message !== undefined && { message: this.message }),
      ...(this.lastFrameAtMs !== undefined && { lastFrameAt: new Date(this.lastFrameAtMs).toISOString() }),
      framesOk: this.framesOk,
      framesRejected: this.framesRejected,
      ...(this.lastRejection !== undefined && { lastRejection: this.lastRejection }),
    };
  }

  private set(state: SourceState, message: string | undefined): void {
    if (state === this.state && message === this.message) return;
    this.state = state;
    this.message = message;
    try {
      this.onChange(this.snapshot());
    } catch {
      // A listener's fault must not stop the source; the manager isolates and logs its own listeners.
    }
  }

  private armWatchdog(delayMs: number | undefined): void {
    if (delayMs === undefined) return;
    this.watchdog = this.clock.setTimeout(() => {
      this.watchdog = undefined;
      const quietMs = this.clock.nowMs() - this.watchFromMs;
      if (quietMs < this.staleAfterMs!) return this.armWatchdog(this.staleAfterMs! - quietMs);
      this.set('stale', `no valid frame for ${Math.round(this.staleAfterMs! / MS_PER_S)} s`);
      this.onStale();
    }, delayMs);
  }

  private disarmWatchdog(): void {
    if (this.watchdog !== undefined) this.clock.clearTimeout(this.watchdog);
    this.watchdog = undefined;
  }
}
