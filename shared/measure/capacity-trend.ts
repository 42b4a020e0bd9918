import type { Run } from '../schemas/run.js';

/** One capacity test of a pack, as a point of its state-of-health trend. */
export interface CapacityPoint {
  runId: number;
  runName: string;
  /** When the run started (ISO), or when it was recorded if it never started. */
  at: string;
  deliveredAh: number;
  deliveredWh: number;
  /** Delivered Ah ÷ the pack's rated Ah × 100; null when the pack has no Ah rating. */
  percentRatedAh: number | null;
  /** Delivered Wh ÷ the pack's rated Wh × 100; null when the pack has no Wh rating. */
  percentRatedWh: number | null;
}

const PERCENT = 100;

/**
 * The pack's capacity run by run, oldest first: every finished capacity discharge with a
 * measured capacity, its delivered Ah and Wh and their share of the pack's rating (state of health as
 * the capacity ratio, common practice). Aborted runs and other kinds of test are left out:
 * they did not run to the end voltage, so their capacity says nothing about health.
 */
export function capacityTrend(runs: readonly Run[], rating: { ratedAh: number | null; ratedWh: number | null }): CapacityPoint[] {
  const share = (value: number, rated: number | null) => (rated !== null && rated > 0 ? (value / rated) * PERCENT : null);
  return runs
    .filter((run) => run.kind === 'capacity-discharge' && run.state === 'finished' && run.summary !== null)
    .map((run) => ({ run, at: run.startedAt ?? run.createdAt, capacity: measuredCapacity(run.summary!) }))
    .filter((p): p is { run: Run; at: string; capacity: { ah: number; wh: number } } => p.capacity !== null)
    .sort((a, b) => Date.parse(a.at) - Date.parse(b.at) || a.run.id - b.run.id)
    .map(({ run, at, capacity }) => ({
      runId: run.id,
      runName: run.name,
      at,
      deliveredAh: capacity.ah,
      deliveredWh: capacity.wh,
      percentRatedAh: share(capacity.ah, rating.ratedAh),
      percentRatedWh: share(capacity.wh, rating.ratedWh),
    }));
}

/**
 * The capacity a run measured (to the end voltage, or the protection that ended the test);
 * null when it measured none (incomplete). Summaries stored before the capacity was kept
 * apart (no `capacityEndedBy`) give their whole-run discharge, as they showed then.
 */
function measuredCapacity(summary: NonNullable<Run['summary']>): { ah: number; wh: number } | null {
  if (summary.capacityEndedBy === null) return { ah: summary.dischargeAh, wh: summary.dischargeWh };
  if (summary.capacityAh === null || summary.capacityWh === null) return null;
  return { ah: summary.capacityAh, wh: summary.capacityWh };
}
