import { performance } from 'node:perf_hooks';

/** Delays go into a fixed histogram (0.1 ms steps up to 60 s), so a long soak measures without growing. */
const HIST_STEP_MS = 0.1;
const HIST_SLOTS = 600_000;

/** A fixed-size delay histogram with quantiles (for the gateways benchmark's processes). */
export class DelayHistogram {
  private readonly counts = new Uint32Array(HIST_SLOTS + 1);
  n = 0;
  max = 0;
  /** Counts one delay, ms. */
  add(ms: number): void {
    this.counts[Math.min(HIST_SLOTS, Math.max(0, Math.floor(ms / HIST_STEP_MS)))]!++;
    this.n++;
    if (ms > this.max) this.max = ms;
  }
  /** Upper edge of the slot holding the p-quantile; NaN when empty. */
  quantile(p: number): number {
    if (this.n === 0) return Number.NaN;
    const want = Math.ceil(this.n * p);
    let seen = 0;
    for (let i = 0; i <= HIST_SLOTS; i++) {
      seen += this.counts[i]!;
      if (seen >= want) return (i + 1) * HIST_STEP_MS;
    }
    return Number.NaN;
  }
}

/** Wall-clock milliseconds with sub-millisecond resolution (comparable across processes on one machine). */
export const wallMs = () => performance.timeOrigin + performance.now();
