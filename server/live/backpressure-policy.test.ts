import { describe, expect, it } from 'vitest';
import { BACKPRESSURE_HIGH_BYTES, BACKPRESSURE_LOW_BYTES, keepEveryFor, thinIndices } from './backpressure-policy.js';

describe('keepEveryFor', () => {
  it('sends everything to a client that keeps up', () => {
    expect(keepEveryFor(0)).toBe(1);
    expect(keepEveryFor(BACKPRESSURE_LOW_BYTES - 1)).toBe(1);
  });
  it('thins more as the backlog grows, and stops readings past the high mark', () => {
    const a = keepEveryFor(BACKPRESSURE_LOW_BYTES);
    const b = keepEveryFor((BACKPRESSURE_LOW_BYTES + BACKPRESSURE_HIGH_BYTES) / 2);
    expect(a).toBeGreaterThan(1);
    expect(b).toBeGreaterThan(a);
    expect(keepEveryFor(BACKPRESSURE_HIGH_BYTES)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('thinIndices', () => {
  it('keeps all when not thinning', () => {
    expect(thinIndices(3, 1, 0).keep).toEqual([0, 1, 2]);
  });
  it('keeps every Nth and always the newest; the counts add up', () => {
    const { keep } = thinIndices(10, 4, 0);
    expect(keep).toEqual([0, 4, 8, 9]);
  });
  it('carries the phase across batches so thinning is even over time', () => {
    const first = thinIndices(3, 4, 0); // keeps 0 and 2 (newest)
    const second = thinIndices(3, 4, first.phase);
    expect(first.phase).toBe(3);
    expect(second.keep).toEqual([1, 2]); // position 4 overall, plus the newest
  });
  it('drops everything past the high mark', () => {
    expect(thinIndices(5, Number.POSITIVE_INFINITY, 0)).toEqual({ keep: [], phase: 5 });
  });
});
