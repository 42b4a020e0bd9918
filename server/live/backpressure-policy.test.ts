import { describe, expect, it } from 'vitest';
import {
  CLIENT_BUDGET_BYTES,
  CLIENT_HARD_LIMIT_BYTES,
  OVER_BUDGET_GRACE_MS,
  READINGS_STOP_BYTES,
  THIN_ENTER_BYTES,
  THIN_LEAVE_BYTES,
  checkBudget,
  keepEveryFor,
  nextThinning,
  thinIndices,
} from './backpressure-policy.js';

describe('nextThinning (hysteresis)', () => {
  it('starts thinning only above the high mark and stops only below the low mark', () => {
    const between = (THIN_LEAVE_BYTES + THIN_ENTER_BYTES) / 2;
    expect(nextThinning(false, between)).toBe(false);
    expect(nextThinning(false, THIN_ENTER_BYTES + 1)).toBe(true);
    // Falling back between the marks keeps thinning: no flip-flop near one threshold.
    expect(nextThinning(true, between)).toBe(true);
    expect(nextThinning(true, THIN_LEAVE_BYTES)).toBe(true);
    expect(nextThinning(true, THIN_LEAVE_BYTES - 1)).toBe(false);
  });

  it('a backlog oscillating around one mark changes mode twice, not on every swing', () => {
    let thinning = false;
    let changes = 0;
    const swings = [THIN_ENTER_BYTES + 1, THIN_ENTER_BYTES - 1, THIN_ENTER_BYTES + 1, THIN_ENTER_BYTES - 1, THIN_LEAVE_BYTES - 1];
    for (const bytes of swings) {
      const next = nextThinning(thinning, bytes);
      if (next !== thinning) changes++;
      thinning = next;
    }
    expect(changes).toBe(2);
  });
});

describe('keepEveryFor', () => {
  it('sends everything to a client that is not thinning', () => {
    expect(keepEveryFor(0, false)).toBe(1);
    expect(keepEveryFor(THIN_ENTER_BYTES, false)).toBe(1);
  });

  it('thins more as the backlog grows, and stops readings past the stop mark whatever the mode', () => {
    const a = keepEveryFor(THIN_LEAVE_BYTES, true);
    const b = keepEveryFor((THIN_ENTER_BYTES + READINGS_STOP_BYTES) / 2, true);
    expect(a).toBeGreaterThan(1);
    expect(b).toBeGreaterThan(a);
    expect(keepEveryFor(READINGS_STOP_BYTES, true)).toBe(Number.POSITIVE_INFINITY);
    expect(keepEveryFor(READINGS_STOP_BYTES, false)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('checkBudget', () => {
  const fresh = { overSinceMs: null, close: false };

  it('lets a client be over its budget for the grace period, then closes it', () => {
    let s = checkBudget(fresh, CLIENT_BUDGET_BYTES, 1000);
    expect(s).toEqual({ overSinceMs: 1000, close: false });
    s = checkBudget(s, CLIENT_BUDGET_BYTES + 1, 1000 + OVER_BUDGET_GRACE_MS - 1);
    expect(s.close).toBe(false);
    s = checkBudget(s, CLIENT_BUDGET_BYTES + 1, 1000 + OVER_BUDGET_GRACE_MS);
    expect(s.close).toBe(true);
    // Once closing, always closing.
    expect(checkBudget(s, 0, 1e9).close).toBe(true);
  });

  it('restarts the grace period when the client drains below its budget', () => {
    let s = checkBudget(fresh, CLIENT_BUDGET_BYTES, 0);
    s = checkBudget(s, CLIENT_BUDGET_BYTES - 1, OVER_BUDGET_GRACE_MS - 1);
    expect(s).toEqual({ overSinceMs: null, close: false });
    s = checkBudget(s, CLIENT_BUDGET_BYTES, OVER_BUDGET_GRACE_MS);
    expect(s.close).toBe(false);
  });

  it('closes at once at the hard limit', () => {
    expect(checkBudget(fresh, CLIENT_HARD_LIMIT_BYTES, 0).close).toBe(true);
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

  it('drops everything past the stop mark', () => {
    expect(thinIndices(5, Number.POSITIVE_INFINITY, 0)).toEqual({ keep: [], phase: 5 });
  });
});
