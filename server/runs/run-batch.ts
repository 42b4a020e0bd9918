import type { Reading } from '../../shared/schemas/reading.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { RunState } from '../../shared/schemas/run.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';

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
 * What a run hands to its store in one go: the readings numbered from `firstSeq` (as
 * readings, not in any storage format: the store encodes them itself), the events with
 * their per-run sequence numbers, and the run row's new state.
 */
export interface RunBatch {
  runId: number;
  /** The run's index of `readings[0]` (the archive's sequence number). */
  firstSeq: number;
  readings: Reading[];
  events: { eventSeq: number; event: RunEvent }[];
  patch: RunPatch;
}

/**
 * Where the recorder's batches go: the archive, wired in by the composition root. Takes
 * batches in order and never throws (it buffers while its store is away).
 */
export interface RunBatchSink {
  enqueue(batch: RunBatch): void;
}
