import type { Sequelize } from 'sequelize';
import type { Reading } from '../../shared/schemas/reading.js';
import type { RunBatch, RunBatchSink, RunPatch } from '../runs/run-batch.js';
import { readingsToColumns } from '../readings/reading-columns.js';
import type { ArchiveBatch } from './archive-batch.js';
import type { ArchiveWriter } from './archive-writer.js';
import { encodeChunk, type EncodedChunk } from './chunk-encode.js';
import { COMPACT_READINGS, writeBatch, writeBlocks } from './chunk-store.js';

/**
 * The archive's write side as other areas see it: it takes runs' batches of readings and
 * encodes its own blocks, so no producer knows the storage format.
 */

/** Readings an importer should gather before writing one block (the size compaction merges to). */
export const ARCHIVE_BLOCK_READINGS = COMPACT_READINGS;

/** A run's batch as the archive stores it: the readings encoded into one column block. */
export function toArchiveBatch(batch: RunBatch): ArchiveBatch {
  const block = batch.readings.length > 0 ? encodeChunk(batch.firstSeq, readingsToColumns(batch.readings)) : null;
  return { runId: batch.runId, block, events: batch.events, patch: batch.patch };
}

/** The archive as a sink of the run recorder: each batch is encoded here and queued on the ordered writer. */
export function archiveSink(writer: ArchiveWriter): RunBatchSink {
  return { enqueue: (batch) => writer.enqueue(toArchiveBatch(batch)) };
}

/** Writes one batch now, in one transaction (the importer, which has no live viewers to keep up with). */
export function writeRunBatch(sequelize: Sequelize, batch: RunBatch): Promise<void> {
  return writeBatch(sequelize, toArchiveBatch(batch));
}

/** One block of readings encoded by the archive, ready to write; its format is the archive's own. */
export type ArchiveBlock = EncodedChunk;

/**
 * Encodes readings numbered from `firstSeq` as one archive block now, so an importer can
 * encode the next block while the previous group is being committed.
 */
export function encodeReadingBlock(firstSeq: number, readings: readonly Reading[]): ArchiveBlock {
  return encodeChunk(firstSeq, readingsToColumns(readings));
}

/** Writes several encoded blocks and the run's new row state in one transaction (the importer's streaming write). */
export function writeArchiveBlocks(sequelize: Sequelize, runId: number, blocks: readonly ArchiveBlock[], patch: RunPatch): Promise<void> {
  return writeBlocks(sequelize, runId, blocks, patch);
}
