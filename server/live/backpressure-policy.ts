/**
 * How much of a reading stream a client gets, from how many bytes wait in its socket.
 * Below LOW everything; up to HIGH every Nth reading (N grows with the backlog); above
 * HIGH no readings at all until it drains. Events are outside this policy: never dropped.
 */
export const BACKPRESSURE_LOW_BYTES = 64 * 1024;
export const BACKPRESSURE_HIGH_BYTES = 1024 * 1024;
/** The thinning factor doubles for every this-many bytes of backlog above LOW. */
const BYTES_PER_DOUBLING = 128 * 1024;
const MAX_KEEP_EVERY = 64;

/** Keep one reading in `keepEvery` (1 = all, Infinity = none) for a socket with this backlog. */
export function keepEveryFor(bufferedBytes: number): number {
  if (bufferedBytes < BACKPRESSURE_LOW_BYTES) return 1;
  if (bufferedBytes >= BACKPRESSURE_HIGH_BYTES) return Number.POSITIVE_INFINITY;
  const doublings = 1 + Math.floor((bufferedBytes - BACKPRESSURE_LOW_BYTES) / BYTES_PER_DOUBLING);
  return Math.min(MAX_KEEP_EVERY, 2 ** doublings);
}

/**
 * Picks which of `count` readings to send, keeping one in `keepEvery` and always the
 * newest (so a thinned chart still ends at the current value). `phase` carries the
 * position across batches so thinning is even over time.
 */
export function thinIndices(count: number, keepEvery: number, phase: number): { keep: number[]; phase: number } {
  if (keepEvery === 1) return { keep: Array.from({ length: count }, (_, i) => i), phase: 0 };
  if (!Number.isFinite(keepEvery)) return { keep: [], phase: phase + count };
  const keep: number[] = [];
  let p = phase;
  for (let i = 0; i < count; i++, p++) if (p % keepEvery === 0 || i === count - 1) keep.push(i);
  return { keep: dedupe(keep), phase: p % keepEvery };
}

function dedupe(sorted: number[]): number[] {
  return sorted.filter((v, i) => i === 0 || v !== sorted[i - 1]);
}
