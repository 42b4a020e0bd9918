import type { Logger } from '../log/logger.js';
import type { LeasedRow } from './lease-claim.js';

/** A failure the handler reports without throwing: noted on the row, with no warning logged. */
export interface HandledFailure {
  error: string;
  /** Give the row up now instead of retrying. */
  permanent: boolean;
}

/** The timer a worker polls with (tests pass one they fire by hand). */
export interface PollTimer {
  setInterval(callback: () => void, ms: number): unknown;
  clearInterval(handle: unknown): void;
}

/** Node's timers; the poll never keeps the process alive on its own. */
const SYSTEM_TIMER: PollTimer = {
  setInterval: (callback, ms) => setInterval(callback, ms).unref(),
  clearInterval: (handle) => clearInterval(handle as NodeJS.Timeout),
};

/** What a lease worker works on and how. */
export interface LeaseWorkerOptions<Row extends LeasedRow> {
  /** Names the worker in logs, e.g. "alarm delivery". */
  name: string;
  /** Claims up to `limit` due rows for `leaseMs` (the attempt is counted by the claim). */
  claim(now: Date, leaseMs: number, limit: number): Promise<Row[]>;
  /** Hands one row over; throws, or returns a HandledFailure, when it did not go out. */
  handle(row: Row): Promise<HandledFailure | void>;
  /** The row went out: release the claim. */
  markSent(row: Row, now: Date): Promise<void>;
  /** The attempt failed: release the claim with back-off, or give the row up; returns the row's status. */
  markFailed(row: Row, error: string, now: Date, permanent: boolean): Promise<string>;
  /** A thrown error that retrying cannot cure (a malformed address). */
  isPermanent(err: unknown): boolean;
  /** How the warning names a row, e.g. "alarm delivery 12 (email)". */
  describe(row: Row): string;
  /** How often the worker looks for due rows when nothing kicked it. */
  pollMs: number;
  /** How long a claim holds a row: longer than any one send may take. */
  leaseMs: number;
  /** Rows claimed per turn. */
  claimBatch: number;
  nowMs?: () => number;
  timer?: PollTimer;
  log: Logger;
}

/**
 * Works a durable queue whose rows are claimed with a lease: it runs on its own timer, off
 * every request and the recording path, and kick() only schedules a turn; turns never
 * overlap. A turn claims due rows until none are left and hands them over in parallel. A
 * failure is recorded on its row and retried with back-off; one failing row never stops the
 * others. Rows a stopped server held are taken again once their lease ends (see claimLeased).
 */
export class LeaseWorker<Row extends LeasedRow> {
  private handle: unknown = null;
  private running: Promise<void> | null = null;
  private again = false;
  private stopped = false;

  constructor(private readonly options: LeaseWorkerOptions<Row>) {}

  /** Starts the poll timer and runs a turn. */
  start(): void {
    const timer = this.options.timer ?? SYSTEM_TIMER;
    this.stopped = false;
    this.handle = timer.setInterval(() => this.kick(), this.options.pollMs);
    this.kick();
  }

  /** Runs a turn soon (after a row was added); a kick during a turn runs one more after it. */
  kick(): void {
    if (this.stopped) return;
    if (this.running) {
      this.again = true;
      return;
    }
    this.running = this.turn()
      .catch((err: unknown) => this.options.log.error(`${this.options.name} pass failed`, err))
      .finally(() => {
        this.running = null;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }

  /** Resolves once no turn runs (none started or kicked again); for shutdown and tests. */
  async settled(): Promise<void> {
    while (this.running) await this.running;
  }

  /** Stops the timer and waits for the sends under way. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.handle !== null) (this.options.timer ?? SYSTEM_TIMER).clearInterval(this.handle);
    this.handle = null;
    await this.running;
  }

  private now(): Date {
    return new Date((this.options.nowMs ?? Date.now)());
  }

  private async turn(): Promise<void> {
    for (;;) {
      const rows = await this.options.claim(this.now(), this.options.leaseMs, this.options.claimBatch);
      if (rows.length === 0) return;
      await Promise.all(rows.map((row) => this.workOne(row)));
      if (this.stopped) return;
    }
  }

  private async workOne(row: Row): Promise<void> {
    const { options } = this;
    try {
      const failure = await options.handle(row);
      if (failure) await options.markFailed(row, failure.error, this.now(), failure.permanent);
      else await options.markSent(row, this.now());
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      const status = await options.markFailed(row, message, this.now(), options.isPermanent(err));
      options.log.warn(`${options.describe(row)} failed, ${status === 'failed' ? 'given up' : 'will retry'}`, err);
    }
  }
}
