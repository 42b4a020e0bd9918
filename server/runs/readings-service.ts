import type { Sequelize } from 'sequelize';
import type { ReadingsQuery, ReadingsResponse } from '../../shared/schemas/api-runs.js';
import { chunkExtent, readChunks, readStats, reduceOverDischarge, reduceReadings, reduceStats, STATS_GROUP_READINGS } from '../archive/archive-reader.js';
import { InvalidInputError } from '../domain/domain-errors.js';

/** Channels the chart needs; totals and aux columns stay compressed. */
const CHART_COLUMNS = ['elapsedSeconds', 'volts', 'amps', 'temp:*'] as const;
/** Use the pre-computed groups when a bucket would span at least this many of them. */
const GROUPS_PER_BUCKET = 4;

type ReducedReadings = ReturnType<typeof reduceReadings>;

/** The archive's reduction in the API's words: its `t` column of axis positions is the answer's `x`. */
function asAnswer(head: Pick<ReadingsResponse, 'runId' | 'axis' | 'from' | 'to'>, reduced: ReducedReadings): ReadingsResponse {
  const { t: x, ...channels } = reduced;
  return { ...head, ...channels, x };
}

/**
 * History of a run for a chart: readings between `from` and `to` (run seconds; default
 * the whole run) as min/max buckets, or every reading when few enough. With the axis `ah` or
 * `wh` it is the delivered discharge so far (see dischargeReadings).
 */
export async function runReadings(sequelize: Sequelize, runId: number, q: ReadingsQuery, maxGapSeconds?: number): Promise<ReadingsResponse> {
  if (q.x !== 'elapsedSeconds') return dischargeReadings(sequelize, runId, q, q.x, maxGapSeconds);
  const axis = 'elapsedSeconds' as const;
  const extent = await chunkExtent(sequelize, runId);
  const from = q.from ?? extent?.from ?? 0;
  const to = q.to ?? extent?.to ?? 0;
  if (to < from) throw new InvalidInputError('`to` must not be before `from`', { to: ['must be >= from'] });
  // Two finite ends can still be an infinite span (-1e308 to 1e308): every bucket time would be NaN.
  if (!Number.isFinite(to - from)) throw new InvalidInputError('The window from `from` to `to` is too wide', { to: ['to - from must be a finite number of seconds'] });
  if (!extent) return asAnswer({ runId, axis, from, to }, reduceReadings([], from, to, q.maxPoints));
  // Estimate the readings in the window from the run's mean rate; the groups are exact enough
  // once each bucket would hold several of them.
  const span = extent.to - extent.from;
  const estimate = span > 0 ? (extent.count * Math.max(0, Math.min(to, extent.to) - Math.max(from, extent.from))) / span : extent.count;
  if (estimate >= q.maxPoints * STATS_GROUP_READINGS * GROUPS_PER_BUCKET) {
    return asAnswer({ runId, axis, from, to }, reduceStats(await readStats(sequelize, runId, from, to), from, to, q.maxPoints));
  }
  const parts = await readChunks(sequelize, runId, from, to, CHART_COLUMNS);
  return asAnswer({ runId, axis, from, to }, reduceReadings(parts, from, to, q.maxPoints));
}

/**
 * The whole run on the delivered Ah or Wh axis: every reading is read (the cumulative figure
 * needs the run from its start), integrated by the core's step with the run's gap limit,
 * then bucketed over [from, to] in Ah or Wh (default 0 to the delivered total).
 */
async function dischargeReadings(sequelize: Sequelize, runId: number, q: ReadingsQuery, axis: 'ah' | 'wh', maxGapSeconds?: number): Promise<ReadingsResponse> {
  const extent = await chunkExtent(sequelize, runId);
  const parts = extent ? await readChunks(sequelize, runId, extent.from, extent.to, CHART_COLUMNS) : [];
  if (q.from !== undefined && q.to !== undefined && q.to < q.from) throw new InvalidInputError('`to` must not be before `from`', { to: ['must be >= from'] });
  if (q.from !== undefined && q.to !== undefined && !Number.isFinite(q.to - q.from)) throw new InvalidInputError('The window from `from` to `to` is too wide', { to: ['to - from must be a finite number'] });
  try {
    const { from, to, ...reduced } = reduceOverDischarge(parts, axis, { from: q.from, to: q.to }, q.maxPoints, maxGapSeconds);
    return asAnswer({ runId, axis, from, to }, reduced);
  } catch (e) {
    // Only `from` given and beyond the delivered total: the default `to` lies before it.
    if (e instanceof RangeError) throw new InvalidInputError('`to` must not be before `from`', { to: ['must be >= from'] });
    throw e;
  }
}
