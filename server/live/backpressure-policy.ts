/**
 * How much a client gets, from how many bytes wait in its socket (`bufferedAmount`), for
 * every message type it is sent.
 *
 * Readings are thinned with hysteresis: thinning starts when the backlog passes the high
 * mark and ends only when it falls below the low mark, so a client near one threshold does
 * not flip between full and thinned streams batch after batch. While thinning, every Nth
 * reading goes (N grows with the backlog); past READINGS_STOP_BYTES none do.
 *
 * Every message (snapshots, errors, pongs, events, readings) counts against one byte
 * budget per client. Events are never dropped: a client that stays over the budget for
 * OVER_BUDGET_GRACE_MS, or reaches CLIENT_HARD_LIMIT_BYTES at any moment, is closed instead,
 * which is what bounds the server's memory per client.
 */

/** Backlog below which a thinned client gets every reading again (the low mark). */
export const THIN_LEAVE_BYTES = 64 * 1024;
/** Backlog above which readings start being thinned (the high mark). */
export const THIN_ENTER_BYTES = 256 * 1024;
/** Backlog from which no readings at all go until the client drains. */
export const READINGS_STOP_BYTES = 1024 * 1024;
/** Bytes one client may keep waiting for a while (a slow link catching up). */
export const CLIENT_BUDGET_BYTES = 4 * 1024 * 1024;
/** How long a client may stay over its budget before it is closed. */
export const OVER_BUDGET_GRACE_MS = 5_000;
/** Bytes at which a client is closed at once, whatever the grace left: the hard bound. */
export const CLIENT_HARD_LIMIT_BYTES = 16 * 1024 * 1024;

/** The thinning factor doubles for every this-many bytes of backlog above the low mark. */
const BYTES_PER_DOUBLING = 128 * 1024;
const MAX_KEEP_EVERY = 64;

/** Whether a client thins its readings now, given whether it did before (hysteresis). */
export function nextThinning(wasThinning: boolean, bufferedBytes: number): boolean {
  return wasThinning ? bufferedBytes >= THIN_LEAVE_BYTES : bufferedBytes > THIN_ENTER_BYTES;
}

/** Keep one reading in `keepEvery` (1 = all, Infinity = none) for a socket with this backlog. */
export function keepEveryFor(bufferedBytes: number, thinning: boolean): number {
  if (bufferedBytes >= READINGS_STOP_BYTES) return Number.POSITIVE_INFINITY;
  if (!thinning) return 1;
  const doublings = 1 + Math.floor(Math.max(0, bufferedBytes - THIN_LEAVE_BYTES) / BYTES_PER_DOUBLING);
  return Math.min(MAX_KEEP_EVERY, 2 ** doublings);
}

/** Where a client stands against its byte budget. */
export interface BudgetState {
  /** When the client went over CLIENT_BUDGET_BYTES, or null while within it. */
  overSinceMs: number | null;
  /** True once the client must be closed. */
  close: boolean;
}

/** The budget state after observing `bufferedBytes` at `nowMs`. */
export function checkBudget(previous: BudgetState, bufferedBytes: number, nowMs: number): BudgetState {
  if (previous.close || bufferedBytes >= CLIENT_HARD_LIMIT_BYTES) return { overSinceMs: previous.overSinceMs ?? nowMs, close: true };
  if (bufferedBytes < CLIENT_BUDGET_BYTES) return { overSinceMs: null, close: false };
  const overSinceMs = previous.overSinceMs ?? nowMs;
  return { overSinceMs, close: nowMs - overSinceMs >= OVER_BUDGET_GRACE_MS };
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
