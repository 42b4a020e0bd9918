import type { Sequelize } from 'sequelize';
import type { SamplesQuery, SamplesResponse } from '../../shared/schemas/api-runs.js';
import { chunkExtent, readChunks } from '../archive/chunk-store.js';
import { reduceSamples } from '../archive/sample-reducer.js';
import { HttpError } from '../http/http-error.js';

/** Channels the chart needs; totals and aux columns stay compressed. */
const CHART_COLUMNS = ['elapsed', 'volts', 'amps', 'temp:*'] as const;

/**
 * History of a run for a chart: readings between `from` and `to` (run seconds; default
 * the whole run) as min/max buckets, or every reading when few enough.
 */
export async function runSamples(sequelize: Sequelize, runId: number, q: SamplesQuery): Promise<SamplesResponse> {
  const extent = await chunkExtent(sequelize, runId);
  const from = q.from ?? extent?.from ?? 0;
  const to = q.to ?? extent?.to ?? 0;
  if (to < from) throw new HttpError(400, '`to` must not be before `from`', { to: ['must be >= from'] });
  const parts = extent ? await readChunks(sequelize, runId, from, to, CHART_COLUMNS) : [];
  const r = reduceSamples(parts, from, to, q.maxPoints);
  return { runId, from, to, ...r };
}
