import { performance } from 'node:perf_hooks';

/** Delays go into a fixed histogram of 0.1 ms steps, so a long soak measures without growing. */
const HIST_STEP_MS = 0.1;
/** The range when none is given: a gateway's frame may take seconds through MQTT and the hub. */
const DEFAULT_RANGE_MS = 60_000;

/**
 * A fixed-size delay histogram with quantiles (for the benchmarks' viewer processes). Delays
 * past `rangeMs` count in the last slot; the maximum is kept exactly.
 */
export class DelayHistogram {
  private readonly slots: number;
  private readonly counts: Uint32Array;
  n = 0;
  max = 0;

  constructor(rangeMs = DEFAULT_RANGE_MS) {
    this.slots = Math.ceil(rangeMs / HIST_STEP_MS);
    this.counts = new Uint32Array(this.slots + 1);
  }

  /** Counts one delay, ms. */
  add(ms: number): void {
    this.counts[Math.min(this.slots, Math.max(0, Math.floor(ms / HIST_STEP_MS)))]!++;
    this.n++;
    if (ms > this.max) this.max = ms;
  }
  /** Upper edge of the slot holding the p-quantile; NaN when empty. */
  quantile(p: number): number {
    if (this.n === 0) return Number.NaN;
    const want = Math.ceil(this.n * p);
    let seen = 0;
    for (let i = 0; i <= this.slots; i++) {
      seen += this.counts[i]!;
      if (seen >= want) return (i + 1) * HIST_STEP_MS;
    }
    return Number.NaN;
  }
}

/** Wall-clock milliseconds with sub-millisecond resolution (comparable across processes on one machine). */
export const wallMs = () => performance.timeOrigin + performance.now();
