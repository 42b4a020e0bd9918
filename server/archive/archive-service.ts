import { join } from 'node:path';
import type { Sequelize } from 'sequelize';
import type { ArchiveBatch } from './archive-batch.js';
import { ArchiveWriter } from './archive-writer.js';
import { COMPACT_READINGS, compactRun, writeBatch } from './chunk-store.js';
import { SpillStore } from './spill-store.js';
import { isConnectionFailure } from '../db/connection-errors.js';
import type { Logger } from '../log/logger.js';

/**
 * Connection trouble is worth waiting out; an SQL error (missing run or table) is not. A
 * connection the killed server closed mid-query arrives as a DatabaseError marked fatal:
 * that one is connection trouble too, or a database restart would set batches aside.
 */
export function isTransient(err: unknown): boolean {
  if (isConnectionFailure(err)) return true;
  const name = (err as { name?: string })?.name ?? '';
  return name !== 'SequelizeDatabaseError' && name !== 'SequelizeForeignKeyConstraintError';
}

export interface ArchiveOptions {
  spillDir: string;
  memoryLimitBytes?: number;
  log?: Logger;
  sleep?: (ms: number) => Promise<void>;
  /** Told of every batch once it is in the database (the journal drops what the archive holds). */
  onArchived?: (batch: ArchiveBatch) => void;
}

/**
 * The archive as the recorder sees it: an ordered writer into MariaDB that buffers and
 * spills while the database is away, and merges a run's small live chunks into larger
 * blocks once enough have gathered (and all of them when the run ends).
 */
export function createArchiveWriter(sequelize: Sequelize, opts: ArchiveOptions): ArchiveWriter {
  const smallReadings = new Map<number, number>();
  const afterWrite = async (batch: ArchiveBatch) => {
    opts.onArchived?.(batch);
    const n = (smallReadings.get(batch.runId) ?? 0) + (batch.block?.count ?? 0);
    const ended = batch.patch.endedAt !== undefined;
    if (n >= COMPACT_READINGS || ended) {
      await compactRun(sequelize, batch.runId, ended);
      smallReadings.delete(batch.runId);
    } else smallReadings.set(batch.runId, n);
  };
  const deadLetters = new SpillStore(join(opts.spillDir, 'failed'));
  return new ArchiveWriter({
    write: (batch) => writeBatch(sequelize, batch),
    isTransient,
    deadLetter: (batch) => deadLetters.push(batch),
    spill: new SpillStore(opts.spillDir),
    memoryLimitBytes: opts.memoryLimitBytes,
    afterWrite,
    log: opts.log,
    sleep: opts.sleep,
  });
}
