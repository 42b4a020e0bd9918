import { mkdir, open, readdir, readFile, rm, truncate, unlink, type FileHandle } from 'node:fs/promises';
import { join } from 'node:path';
import type { Frame } from '../../shared/schemas/frame.js';
import type { Reading } from '../../shared/schemas/reading.js';
import { decodeJournal, encodeRecord, type JournalRecord } from './journal-record.js';
import { MS_PER_S } from '../../shared/units/time.js';
import { createLogger, type Logger } from '../log/logger.js';

/** Readings reach the disk (written and fdatasync'd) at least this often: half the 100 ms promise. */
export const JOURNAL_SYNC_INTERVAL_MS = 50;
/** fdatasync calls in flight at once (the rest of the thread pool stays free for writes). */
export const JOURNAL_SYNC_CONCURRENCY = 2;
/** Default bound on the journal's bytes (pending and on disk): hours of a busy lab's outage. */
export const JOURNAL_MAX_BYTES = 256 * 1024 * 1024;
/** A segment file is closed after this many readings, so archived ones can be deleted in pieces. */
export const JOURNAL_SEGMENT_READINGS = 5000;
const SEGMENT_SUFFIX = '.jnl';
const RUN_PREFIX = 'run-';
const RUN_FOLDER = /^run-(\d{1,15})$/;
const INDEX_DIGITS = 12;

export interface ReadingJournalOptions {
  /** Folder of the journal (<dataDir>/journal): one sub-folder per run, one file per segment. */
  dir: string;
  syncIntervalMs?: number;
  maxBytes?: number;
  segmentReadings?: number;
  log?: Logger;
  /** Server clock in ms (default Date.now). */
  nowMs?: () => number;
  /** Injected timers (tests fire the batch by hand). */
  setInterval?: (fn: () => void, ms: number) => { unref?: () => void };
  setImmediate?: (fn: () => void) => void;
  clearInterval?: (handle: unknown) => void;
}

interface Segment {
  path: string;
  lastIndex: number;
  bytes: number;
}

interface RunJournalState {
  dir: string;
  /** Closed segments, oldest first, and the open one (last) while it takes appends. */
  segments: Segment[];
  active: { segment: Segment; handle: FileHandle; readings: number; unsynced: boolean } | null;
  /** A segment file was created since the folder was last synced. */
  dirUnsynced: boolean;
  pending: string[];
  pendingBytes: number;
  pendingLastIndex: number;
  /** Highest index journalled (written or pending); -1 for none. */
  lastIndex: number;
  /** Readings below this index are in the database. */
  archivedCount: number;
  ended: boolean;
}

/** What the journal held for one run at start. */
export interface RecoveredRun {
  runId: number;
  records: JournalRecord[];
}

/** Counts for the benchmark and the logs. */
export interface JournalStats {
  bytes: number;
  dropped: number;
  syncs: number;
  /** How long the last write of pending lines took (after it, safe from a process crash). */
  lastWriteMs: number;
  /** How long the last batch took until every file was fdatasync'd (safe from a power cut). */
  lastSyncMs: number;
  maxSyncMs: number;
}

/**
 * The readings journal: a sink of its own beside the live hub and the archive. Every
 * reading a run accepts is appended to that run's journal and written with fdatasync in
 * batches every JOURNAL_SYNC_INTERVAL_MS, so it is on disk well within 100 ms even while
 * the database is away. Segments whose readings are all in the database are deleted, and
 * a run's folder goes once its final batch is archived. At start, `recover()` hands back
 * what was journalled (a torn last record, from a crash mid-write, is cut off and logged;
 * a corrupt journal never stops the server) so the recorder can replay it before the run
 * hears its meter again.
 */
export class ReadingJournal {
  private readonly runs = new Map<number, RunJournalState>();
  private readonly stats: JournalStats = { bytes: 0, dropped: 0, syncs: 0, lastWriteMs: 0, lastSyncMs: 0, maxSyncMs: 0 };
  private timer: { unref?: () => void } | null = null;
  /** Writes and file changes (open, close, delete), one at a time, so two never race on one file. */
  private queue: Promise<void> = Promise.resolve();
  /** Batches of fdatasync, one at a time; they run beside later writes, never beside a close. */
  private syncs: Promise<void> = Promise.resolve();
  private syncQueued: Promise<void> | null = null;
  private writeScheduled = false;
  private full = false;
  private readonly now: () => number;
  private readonly log: Logger;

  constructor(private readonly opts: ReadingJournalOptions) {
    this.now = opts.nowMs ?? Date.now;
    this.log = opts.log ?? createLogger('journal');
  }

  /** Starts the batch timer. */
  start(): void {
    if (this.timer) return;
    const every = this.opts.setInterval ?? ((fn, ms) => setInterval(fn, ms));
    this.timer = every(() => void this.flush(), this.opts.syncIntervalMs ?? JOURNAL_SYNC_INTERVAL_MS);
    this.timer.unref?.();
  }

  /** Takes one accepted reading (its index in the run); never throws, never waits. */
  append(runId: number, index: number, reading: Reading): void {
    const run = this.runOf(runId);
    if (index <= run.lastIndex) return; // replayed from this journal: already on disk
    const frame: Frame = { t: reading.t, volts: reading.volts, amps: reading.amps, temps: reading.temps, aux: reading.aux, clock: reading.clock, seq: reading.seq };
    const line = encodeRecord(index, this.now() / MS_PER_S, frame);
    if (this.stats.bytes + line.length > (this.opts.maxBytes ?? JOURNAL_MAX_BYTES)) {
      this.stats.dropped++;
      if (!this.full) this.log.warn(`journal: full at ${this.stats.bytes} bytes; readings are held in memory only until the archive catches up`);
      this.full = true;
      return;
    }
    this.full = false;
    run.pending.push(line);
    run.pendingBytes += line.length;
    run.pendingLastIndex = index;
    run.lastIndex = index;
    this.stats.bytes += line.length;
    this.scheduleWrite();
  }

  /**
   * Once started, what arrived in one turn of the event loop is written right after it:
   * a crash of the process then loses only the readings of that turn. The fdatasync that
   * also survives a power cut follows on the batch timer.
   */
  private scheduleWrite(): void {
    if (this.writeScheduled || !this.timer) return;
    this.writeScheduled = true;
    (this.opts.setImmediate ?? setImmediate)(() => {
      this.writeScheduled = false;
      void this.enqueue(() => this.writeAll());
    });
  }

  private enqueue(step: () => Promise<void>): Promise<void> {
    const next = this.queue.then(step).catch((err: unknown) => this.log.error('journal: a step failed', err));
    this.queue = next;
    return next;
  }

  /** The database holds the run's readings below `count`; `ended` once its final batch is in. */
  archived(runId: number, count: number, ended = false): void {
    const run = this.runs.get(runId);
    if (!run) return;
    run.archivedCount = Math.max(run.archivedCount, count);
    run.ended ||= ended;
  }

  /** Resolves once the disk work queued so far (writes, syncs) is done. */
  settled(): Promise<void> {
    return this.queue;
  }

  /** Writes and syncs everything taken so far, and deletes what the database already holds. */
  flush(): Promise<void> {
    // A sync waiting in the queue will also take what arrives until it starts: join it.
    this.syncQueued ??= this.syncs = this.syncs
      .then(() => {
        this.syncQueued = null;
        return this.syncAll();
      })
      .catch((err: unknown) => this.log.error('journal: a step failed', err));
    return this.syncQueued;
  }

  /** Reads every run's journal left by an earlier process; call once, before the first append. */
  async recover(): Promise<RecoveredRun[]> {
    await mkdir(this.opts.dir, { recursive: true });
    const found: RecoveredRun[] = [];
    for (const name of (await readdir(this.opts.dir)).sort()) {
      const match = RUN_FOLDER.exec(name);
      const runId = Number(match?.[1]);
      if (!match || !Number.isSafeInteger(runId)) continue;
      try {
        found.push({ runId, records: await this.recoverRun(runId) });
      } catch (err) {
        this.log.error(`journal: run ${runId} could not be read; left as it is`, err);
      }
    }
    return found;
  }

  /** Deletes a run's whole journal (its readings are all archived, or the run is gone). */
  async discard(runId: number): Promise<void> {
    const run = this.runs.get(runId);
    this.runs.delete(runId);
    await run?.active?.handle.close().catch(() => undefined);
    if (run) this.stats.bytes -= run.segments.reduce((n, s) => n + s.bytes, 0) + run.pendingBytes;
    await rm(this.runDir(runId), { recursive: true, force: true });
  }

  /** Stops the timer, writes what is pending and closes the files (kept for the next start). */
  async close(): Promise<void> {
    if (this.timer) (this.opts.clearInterval ?? ((h) => clearInterval(h as NodeJS.Timeout)))(this.timer);
    this.timer = null;
    await this.flush();
    for (const run of this.runs.values()) {
      await run.active?.handle.close().catch(() => undefined);
      run.active = null;
    }
  }

  getStats(): JournalStats {
    return { ...this.stats };
  }

  private runDir(runId: number): string {
    return join(this.opts.dir, `${RUN_PREFIX}${runId}`);
  }

  private runOf(runId: number): RunJournalState {
    let run = this.runs.get(runId);
    if (!run) {
      run = { dir: this.runDir(runId), segments: [], active: null, pending: [], pendingBytes: 0, pendingLastIndex: -1, lastIndex: -1, archivedCount: 0, ended: false, dirUnsynced: false };
      this.runs.set(runId, run);
    }
    return run;
  }

  private async recoverRun(runId: number): Promise<JournalRecord[]> {
    const run = this.runOf(runId);
    const records: JournalRecord[] = [];
    const files = (await readdir(run.dir)).filter((f) => f.endsWith(SEGMENT_SUFFIX)).sort();
    for (const file of files) {
      const path = join(run.dir, file);
      const decoded = decodeJournal(await readFile(path));
      if (decoded.problem) {
        this.log.warn(`journal: run ${runId} ${file}: ${decoded.problem}; cut off after ${decoded.records.length} good readings`);
        await truncate(path, decoded.goodBytes);
      }
      records.push(...decoded.records);
      const last = decoded.records[decoded.records.length - 1];
      run.segments.push({ path, lastIndex: last?.i ?? -1, bytes: decoded.goodBytes });
      this.stats.bytes += decoded.goodBytes;
      if (last) run.lastIndex = Math.max(run.lastIndex, last.i);
    }
    return records;
  }

  /** Writes every run's pending lines (from then on a crash of the process cannot lose them). */
  private async writeAll(): Promise<void> {
    const started = this.now();
    let wrote = false;
    await Promise.all(
      [...this.runs].map(async ([runId, run]) => {
        if (run.pending.length > 0 && (await this.guard(runId, () => this.writePending(run)))) wrote = true;
      }),
    );
    if (wrote) this.stats.lastWriteMs = this.now() - started;
  }

  /**
   * One batch: what is pending is written, every file written since the last batch is
   * fdatasync'd side by side (safe from a power cut too; new writes go on meanwhile), then
   * full segments are closed and archived ones deleted.
   */
  private async syncAll(): Promise<void> {
    const started = this.now();
    await this.enqueue(() => this.writeAll());
    const dirty = [...this.runs].filter(([, run]) => run.active?.unsynced);
    // A few at a time: fdatasync holds a libuv worker thread (4 by default) until the disk
    // answers, and the writes that keep readings safe from a crash need one free meanwhile.
    const waiting = [...dirty];
    const worker = async () => {
      for (let next = waiting.shift(); next; next = waiting.shift()) await this.guard(next[0], () => this.syncActive(next[1]));
    };
    await Promise.all(Array.from({ length: JOURNAL_SYNC_CONCURRENCY }, worker));
    await this.enqueue(async () => {
      for (const [runId, run] of [...this.runs]) await this.guard(runId, () => this.tidy(runId, run));
    });
    if (dirty.length === 0) return;
    const took = this.now() - started;
    this.stats.syncs++;
    this.stats.lastSyncMs = took;
    this.stats.maxSyncMs = Math.max(this.stats.maxSyncMs, took);
  }

  /** Runs one step for one run; a failure is logged (the lines stay pending or the file stays) and never spreads. */
  private async guard(runId: number, step: () => Promise<unknown>): Promise<boolean> {
    try {
      await step();
      return true;
    } catch (err) {
      this.log.warn(`journal: run ${runId} could not be written; will retry`, err);
      return false;
    }
  }

  /** Appends a run's pending lines to its open segment, opening one as needed (no sync yet). */
  private async writePending(run: RunJournalState): Promise<void> {
    const lines = run.pending;
    const bytes = run.pendingBytes;
    const lastIndex = run.pendingLastIndex;
    if (!run.active) {
      await mkdir(run.dir, { recursive: true });
      const first = JSON.parse(lines[0]!.slice(lines[0]!.indexOf(' ') + 1)) as { i: number };
      const path = join(run.dir, String(first.i).padStart(INDEX_DIGITS, '0') + SEGMENT_SUFFIX);
      const handle = await open(path, 'a');
      run.dirUnsynced = true; // the new name is made durable with the next sync, off the write path
      const segment = { path, lastIndex: -1, bytes: 0 };
      run.segments.push(segment);
      run.active = { segment, handle, readings: 0, unsynced: false };
    }
    // Taken only once the file is open: a failure above leaves the lines pending for the next try.
    run.pending = [];
    run.pendingBytes = 0;
    const active = run.active;
    await active.handle.write(lines.join(''));
    active.segment.bytes += bytes;
    active.segment.lastIndex = lastIndex;
    active.readings += lines.length;
    active.unsynced = true;
  }

  /** Syncs a run's open segment (no close here: a write may be queued on it). */
  private async syncActive(run: RunJournalState): Promise<void> {
    const active = run.active;
    if (!active) return;
    active.unsynced = false;
    try {
      if (run.dirUnsynced) {
        run.dirUnsynced = false;
        await syncDir(run.dir);
      }
      await active.handle.datasync();
    } catch (err) {
      active.unsynced = true;
      run.dirUnsynced = true;
      throw err;
    }
  }

  /** Closes a full, synced segment (the next reading opens a new one), then drops what the archive holds. */
  private async tidy(runId: number, run: RunJournalState): Promise<void> {
    const active = run.active;
    if (active && !active.unsynced && active.readings >= (this.opts.segmentReadings ?? JOURNAL_SEGMENT_READINGS)) {
      run.active = null;
      await active.handle.close();
    }
    await this.dropArchived(runId, run);
  }

  /** Deletes segments the database holds in full; the whole folder once the run has ended. */
  private async dropArchived(runId: number, run: RunJournalState): Promise<void> {
    const allArchived = run.pending.length === 0 && run.lastIndex < run.archivedCount;
    if (run.ended && allArchived) return this.discard(runId);
    // The open segment stays (reopening files each time the archive catches up would cost a
    // directory sync each); it goes once full and closed, or with the run's folder.
    for (let first = run.segments[0]; first && first !== run.active?.segment && first.lastIndex < run.archivedCount; first = run.segments[0]) {
      run.segments.shift();
      this.stats.bytes -= first.bytes;
      await unlink(first.path).catch(() => undefined);
    }
  }
}

/** Makes a new file's name durable (a crash after fsync of the file alone can lose its entry). */
async function syncDir(dir: string): Promise<void> {
  const handle = await open(dir, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}
