import type { Sequelize } from 'sequelize';
import type { SamplesQuery, SamplesResponse } from '../../shared/schemas/api-runs.js';
import { chunkExtent, readChunks, readStats } from '../archive/chunk-store.js';
import { STATS_GROUP_READINGS } from '../archive/chunk-stats.js';
import { reduceSamples, reduceStats } from '../archive/sample-reducer.js';
import { HttpError } from '../http/http-error.js';

/** Channels the chart needs; totals and aux columns stay compressed. */
const CHART_COLUMNS = ['elapsed', 'volts', 'amps', 'temp:*'] as const;
/** Use the pre-computed groups when a bucket would span at least this many of them. */
const GROUPS_PER_BUCKET = 4;

/**
 * History of a run for a chart: readings between `from` and `to` (run seconds; default
 * the whole run) as min/max buckets, or every reading when few enough.
 */
export async function runSamples(sequelize: Sequelize, runId: number, q: SamplesQuery): Promise<SamplesResponse> {
  const extent = await chunkExtent(sequelize, runId);
  const from = q.from ?? extent?.from ?? 0;
  const to = q.to ?? extent?.to ?? 0;
  if (to < from) throw new HttpError(400, '`to` must not be before `from`', { to: ['must be >= from'] });
  // Two finite ends can still be an infinite span (-1e308 to 1e308): every bucket time would be NaN.
  if (!Number.isFinite(to - from)) throw new HttpError(400, 'The window from `from` to `to` is too wide', { to: ['to - from must be a finite number of seconds'] });
  if (!extent) return { runId, from, to, ...reduceSamples([], from, to, q.maxPoints) };
  // Estimate the readings in the window from the run's mean rate; the groups are exact enough
  // once each bucket would hold several of them.
  const span = extent.to - extent.from;
  const estimate = span > 0 ? (extent.count * Math.max(0, Math.min(to, extent.to) - Math.max(from, extent.from))) / span : extent.count;
  if (estimate >= q.maxPoints * STATS_GROUP_READINGS * GROUPS_PER_BUCKET) {
    return { runId, from, to, ...reduceStats(await readStats(sequelize, runId, from, to), from, to, q.maxPoints) };
  }
  const parts = await readChunks(sequelize, runId, from, to, CHART_COLUMNS);
  return { runId, from, to, ...reduceSamples(parts, from, to, q.maxPoints) };
}
