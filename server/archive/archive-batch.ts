import type { RunBatch } from '../runs/run-batch.js';
import type { EncodedChunk } from './chunk-encode.js';

/**
 * One unit of archive work, written in one transaction: readings (as an encoded column
 * block), events and the run row's new state. Writing it twice is harmless: the chunk key
 * (runId, firstSeq) and the event key (runId, eventSeq) make the inserts idempotent.
 */
export interface ArchiveBatch {
  runId: number;
  block: EncodedChunk | null;
  events: RunBatch['events'];
  patch: RunBatch['patch'];
}

/** Rough size of a batch in memory, for the writer's memory bound. */
export function batchBytes(batch: ArchiveBatch): number {
  const EVENT_BYTES = 512;
  const OVERHEAD_BYTES = 1024;
  return (batch.block ? batch.block.data.length + batch.block.stats.length : 0) + batch.events.length * EVENT_BYTES + (batch.patch.pipelineState?.length ?? 0) + OVERHEAD_BYTES;
}
