import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { RunState } from '../../shared/schemas/run.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';
import type { EncodedChunk } from './chunk-encode.js';

/** Fields of a run row the recorder updates together with each batch of readings. */
export interface RunPatch {
  state?: RunState;
  summary?: RunSummary | null;
  /** Serialised pipeline state after the last reading of the batch (JSON text). */
  pipelineState?: string | null;
  readingsCount?: number;
  startedAt?: Date;
  endedAt?: Date;
}

/**
 * One unit of archive work, written in one transaction: readings (as an encoded column
 * block), events and the run row's new state. Writing it twice is harmless: the chunk key
 * (runId, firstSeq) and the event key (runId, eventSeq) make the inserts idempotent.
 */
export interface ArchiveBatch {
  runId: number;
  block: EncodedChunk | null;
  events: { eventSeq: number; event: RunEvent }[];
  patch: RunPatch;
}

/** Rough size of a batch in memory, for the writer's memory bound. */
export function batchBytes(batch: ArchiveBatch): number {
  const EVENT_BYTES = 512;
  const OVERHEAD_BYTES = 1024;
  return (batch.block ? batch.block.data.length + batch.block.stats.length : 0) + batch.events.length * EVENT_BYTES + (batch.patch.pipelineState?.length ?? 0) + OVERHEAD_BYTES;
}
