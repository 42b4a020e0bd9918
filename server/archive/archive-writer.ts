import { batchBytes, type ArchiveBatch } from './archive-batch.js';
import type { SpillStore } from './spill-store.js';
import type { Logger } from '../log/logger.js';

/** Waits before retrying a failed write: grows to the last value and stays there. */
export const RETRY_DELAYS_MS = [250, 500, 1000, 2000, 5000] as const;
/** Default memory bound for batches waiting on the database. */
export const DEFAULT_MEMORY_LIMIT_BYTES = 32 * 1024 * 1024;

export interface ArchiveWriterOptions {
  write: (batch: ArchiveBatch) => Promise<void>;
  spill: SpillStore;
  memoryLimitBytes?: number;
  /** Called after a batch is in the database (compaction hooks in here). */
  afterWrite?: (batch: ArchiveBatch) => Promise<void>;
  sleep?: (ms: number) => Promise<void>;
  log?: Logger;
  /**
   * False for an error that retrying cannot fix (the run was deleted, the schema is wrong).
   * Such a batch is tried PERMANENT_ERROR_ATTEMPTS times, then handed to `deadLetter` so it
   * is kept for a person to look at instead of blocking every later batch. Default: all
   * errors are transient.
   */
  isTransient?: (err: unknown) => boolean;
  deadLetter?: (batch: ArchiveBatch, err: unknown) => Promise<void>;
}

/** Attempts before a batch with a permanent error is set aside. */
export const PERMANENT_ERROR_ATTEMPTS = 3;

export interface ArchiveWriterStats {
  inMemory: number;
  memoryBytes: number;
  spilled: number;
  written: number;
  failures: number;
  healthy: boolean;
}

/**
 * Writes batches to the database strictly in the order given. While the database is
 * away, batches wait in memory up to a bound, then on disk; once anything is on disk,
 * every newer batch goes to disk too, so memory always holds the oldest work and the
 * order is kept. No batch is dropped: a failed write is retried until it succeeds.
 */
export class ArchiveWriter {
  private readonly memory: ArchiveBatch[] = [];
  private memoryBytes = 0;
  private spillWrites: Promise<void> = Promise.resolve();
  private pendingSpills = 0;
  private draining: Promise<void> | null = null;
  private stopped = false;
  private stats = { written: 0, failures: 0, healthy: true };
  private readonly sleep: (ms: number) => Promise<void>;

  constructor(private readonly opts: ArchiveWriterOptions) {
    this.sleep = opts.sleep ?? ((ms) => new Promise((resolve) => setTimeout(resolve, ms)));
  }

  /** Queues a batch and starts writing in the background. Never throws. */
  enqueue(batch: ArchiveBatch): void {
    const size = batchBytes(batch);
    const limit = this.opts.memoryLimitBytes ?? DEFAULT_MEMORY_LIMIT_BYTES;
    if (this.opts.spill.size > 0 || this.pendingSpills > 0 || this.memoryBytes + size > limit) {
      this.pendingSpills++;
      this.spillWrites = this.spillWrites
        .then(() => this.opts.spill.push(batch))
        .catch((err: unknown) => {
          // The disk failed too: keep the batch in memory rather than lose it.
          this.opts.log?.warn('archive: spill failed; holding the batch in memory', err);
          this.memory.push(batch);
          this.memoryBytes += size;
        })
        .finally(() => {
          this.pendingSpills--;
          this.kick();
        });
    } else {
      this.memory.push(batch);
      this.memoryBytes += size;
    }
    this.kick();
  }

  /** Resolves once everything queued so far (memory and disk) is in the database. */
  async flush(): Promise<void> {
    for (;;) {
      await this.spillWrites;
      if (this.draining) {
        await this.draining;
        continue;
      }
      if (this.stopped || (this.memory.length === 0 && this.opts.spill.size === 0 && this.pendingSpills === 0)) return;
      this.kick();
    }
  }

  /** Starts draining batches an earlier process spilled to disk. */
  async start(): Promise<void> {
    await this.opts.spill.init();
    this.kick();
  }

  /**
   * Shutdown: waits up to `deadlineMs` for the database to take everything, then stops
   * and moves what is still in memory to the front of the spill, for the next start.
   */
  async shutdown(deadlineMs: number): Promise<void> {
    let timer: NodeJS.Timeout | undefined;
    const timedOut = new Promise<boolean>((resolve) => (timer = setTimeout(() => resolve(false), deadlineMs)));
    const done = await Promise.race([this.flush().then(() => true), timedOut]);
    clearTimeout(timer);
    this.stop();
    await this.spillWrites;
    if (!done && this.memory.length) {
      await this.opts.spill.pushFront(this.memory.splice(0));
      this.memoryBytes = 0;
    }
  }

  /** Stops retrying; prefer shutdown(), which keeps what is left. */
  stop(): void {
    this.stopped = true;
  }

  getStats(): ArchiveWriterStats {
    return { inMemory: this.memory.length, memoryBytes: this.memoryBytes, spilled: this.opts.spill.size, ...this.stats };
  }

  private kick(): void {
    if (this.draining || this.stopped) return;
    this.draining = this.drain()
      .catch(async (err: unknown) => {
        // A spill file could not be read: report it and pause so the loop never spins.
        this.opts.log?.warn('archive: drain failed', err);
        await this.sleep(RETRY_DELAYS_MS[RETRY_DELAYS_MS.length - 1]!);
      })
      .finally(() => {
        this.draining = null;
        if (!this.stopped && (this.memory.length > 0 || this.opts.spill.size > 0)) this.kick();
      });
  }

  private async drain(): Promise<void> {
    for (;;) {
      const fromMemory = this.memory[0];
      // Spill files are always newer than what is in memory, and are read back oldest first.
      const batch = fromMemory ?? (await this.opts.spill.peek());
      if (!batch) return;
      await this.writeWithRetry(batch);
      if (this.stopped) return;
      if (fromMemory) {
        this.memory.shift();
        this.memoryBytes -= batchBytes(fromMemory);
      } else {
        await this.opts.spill.shift();
      }
      this.stats.written++;
      await this.opts.afterWrite?.(batch).catch((err: unknown) => this.opts.log?.error('archive: after-write step failed', err));
    }
  }

  private async writeWithRetry(batch: ArchiveBatch): Promise<void> {
    let permanent = 0;
    for (let attempt = 0; !this.stopped; attempt++) {
      try {
        await this.opts.write(batch);
        if (!this.stats.healthy) this.opts.log?.info('archive: database reachable again');
        this.stats.healthy = true;
        return;
      } catch (err) {
        this.stats.failures++;
        if (this.opts.deadLetter && this.opts.isTransient && !this.opts.isTransient(err) && ++permanent >= PERMANENT_ERROR_ATTEMPTS) {
          this.opts.log?.error(`archive: batch for run ${batch.runId} set aside after ${permanent} failures`, err);
          await this.opts.deadLetter(batch, err);
          return;
        }
        if (this.stats.healthy) this.opts.log?.warn('archive: write failed, buffering', err);
        this.stats.healthy = false;
        await this.sleep(RETRY_DELAYS_MS[Math.min(attempt, RETRY_DELAYS_MS.length - 1)]!);
      }
    }
  }
}
