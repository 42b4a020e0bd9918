import { describe, expect, it } from 'vitest';
import { reduceReadings, reduceStats } from './reading-reducer.js';

const cols = (elapsed: number[], volts: number[], amps?: number[]) => ({
  elapsedSeconds: Float64Array.from(elapsed),
  volts: Float64Array.from(volts),
  amps: Float64Array.from(amps ?? volts.map(() => 1)),
});

describe('reduceReadings', () => {
  it('returns every reading when the window holds no more than maxPoints', () => {
    const r = reduceReadings([cols([0, 1, 2, 3], [13, 12.9, 12.8, 12.7])], 1, 2, 10);
    expect(r.reduced).toBe(false);
    expect(r.t).toEqual([1, 2]);
    expect(r.volts.min).toEqual([12.9, 12.8]);
    expect(r.readingsInWindow).toBe(2);
  });

  it('keeps a one-sample spike in a min/max bucket instead of averaging it away', () => {
    const n = 10_000;
    const elapsed = Array.from({ length: n }, (_, i) => i);
    const volts = elapsed.map(() => 12);
    volts[4321] = 3.1; // a protection cutoff dip lasting one sample
    volts[777] = 14.6;
    const r = reduceReadings([cols(elapsed, volts)], 0, n - 1, 100);
    expect(r.reduced).toBe(true);
    expect(r.t).toHaveLength(100);
    expect(Math.min(...(r.volts.min as number[]))).toBe(3.1);
    expect(Math.max(...(r.volts.max as number[]))).toBe(14.6);
    // Averaging 100 samples would have given 12 - 8.9/100; the bucket keeps the extreme.
    expect(r.volts.min[Math.floor(4321 / ((n - 1) / 100))]).toBe(3.1);
  });

  it('leaves an empty bucket null so a chart draws a gap, and spans several parts', () => {
    const a = cols([0, 1, 2, 3, 4], [1, 2, 3, 4, 5]);
    const b = cols([96, 97, 98, 99, 100], [6, 7, 8, 9, 10]);
    const r = reduceReadings([a, b], 0, 100, 5);
    expect(r.reduced).toBe(true);
    expect(r.volts.min).toEqual([1, null, null, null, 6]);
    expect(r.volts.max).toEqual([5, null, null, null, 10]);
    expect(r.watts.max[4]).toBe(10);
  });

  it('reduces temperature channels with the same buckets', () => {
    const p = { ...cols([0, 1, 2, 3], [1, 1, 1, 1]), 'temp:cell': Float64Array.from([20, 25, Number.NaN, 22]) };
    const r = reduceReadings([p], 0, 3, 2);
    expect(r.temps.cell!.min).toEqual([20, 22]);
    expect(r.temps.cell!.max).toEqual([25, 22]);
  });
});

describe('reduceStats', () => {
  it('gives the same extremes as the reading-by-reading reducer, from 64-reading groups', async () => {
    const { computeStats } = await import('./chunk-stats.js');
    const n = 20_000;
    const elapsed = Float64Array.from({ length: n }, (_, i) => i / 10);
    const volts = Float64Array.from({ length: n }, (_, i) => 13 - i * 1e-4 + Math.sin(i) * 0.01);
    volts[12_345] = 2.2; // a one-reading collapse
    const amps = Float64Array.from({ length: n }, () => 4);
    const part = { elapsedSeconds: elapsed, volts, amps, 'temp:cell': Float64Array.from({ length: n }, (_, i) => 20 + i / 1000) };
    const exact = reduceReadings([part], 0, elapsed[n - 1]!, 50);
    const fast = reduceStats([computeStats(part)], 0, elapsed[n - 1]!, 50);
    expect(fast.readingsInWindow).toBe(n);
    const min = (c: (number | null)[]) => Math.min(...(c.filter((v) => v !== null) as number[]));
    expect(min(fast.volts.min)).toBe(2.2);
    expect(min(fast.volts.min)).toBe(min(exact.volts.min));
    expect(Math.max(...(fast.temps.cell!.max as number[]))).toBe(Math.max(...(exact.temps.cell!.max as number[])));
    // Each bucket's extremes are those of the exact reducer or of a neighbouring group's readings.
    for (let b = 0; b < 50; b++) expect(fast.volts.min[b]!).toBeLessThanOrEqual(exact.volts.min[b]!);
  });
});
