import type { BenchStatus } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';

/** Where a source delivers: frames in order, and status changes. */
export interface SourceSink {
  frame(frame: Frame): void;
  status(status: BenchStatus): void;
}

/**
 * A producer of frames for one bench. It never throws into the pipeline: faults become
 * status (reconnecting, error) and rejections are counted in its status.
 */
export interface Source {
  /** Begins producing; returns at once (opening happens in the background). */
  start(): void;
  /** Stops producing and releases the port or simulation; no frame is delivered afterwards. */
  stop(): Promise<void>;
  /** The current status with counts. */
  getStatus(): BenchStatus;
}

/** Calls a sink method, swallowing its exception so a faulty consumer cannot stop a source. */
export function safeDeliver<T>(deliver: (value: T) => void, value: T, onFault?: (err: unknown) => void): void {
  try {
    deliver(value);
  } catch (err) {
    onFault?.(err);
  }
}
