import { describe, expect, it } from 'vitest';
import { finishedRun, summaryDelivering } from '../../tests/fixtures/run-fixtures.js';
import { capacityTrend } from './capacity-trend.js';

// NASA Ames PCoE Li-ion Battery Aging Datasets (Saha & Goebel, 2007), cell B0005: rated 2 Ah,
// cycle 1 capacity 1.8564874208181574 Ah as stated by the data set (tests/fixtures/README.md).
const B0005_RATED_AH = 2;
const B0005_CYCLE1_AH = 1.8564874208181574;
// Energy over the same window, 6.593751 Wh (tests/fixtures/README.md, 6 decimals).
const B0005_CYCLE1_WH = 6.593751;

describe('capacityTrend', () => {
  it('gives the capacity ratio (state of health) of the NASA B0005 first cycle', () => {
    const [point] = capacityTrend([finishedRun(1, '2026-01-01T00:00:00Z', summaryDelivering(B0005_CYCLE1_AH, B0005_CYCLE1_WH))], { ratedAh: B0005_RATED_AH, ratedWh: null });
    expect(point!.percentRatedAh).toBeCloseTo(92.824371, 6); // 1.8564874208181574 / 2 × 100
    expect(point!.deliveredWh).toBe(B0005_CYCLE1_WH);
    expect(point!.percentRatedWh).toBeNull();
  });

  it('orders runs by start, and leaves out aborted runs, other kinds and runs without a summary', () => {
    const s = summaryDelivering(1.5, 5);
    const points = capacityTrend([
      finishedRun(5, '2026-03-01T00:00:00Z', s),
      finishedRun(3, '2026-01-01T00:00:00Z', s),
      finishedRun(4, '2026-02-01T00:00:00Z', s, { state: 'aborted' }),
      finishedRun(6, '2026-02-02T00:00:00Z', s, { kind: 'protection-check' }),
      finishedRun(7, '2026-02-03T00:00:00Z', null),
    ], { ratedAh: 2, ratedWh: 0 });
    expect(points.map((p) => p.runId)).toEqual([3, 5]);
    expect(points[0]!.percentRatedWh).toBeNull(); // a zero rating is no rating, never a division by zero
  });
});
