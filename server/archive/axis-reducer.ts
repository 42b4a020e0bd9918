import { concatColumns, type Columns } from './column-block.js';
import { cumulativeDischarge } from '../../shared/measure/cumulative-discharge.js';
import { reduceReadings, type ReducedReadings } from './reading-reducer.js';

/** A chart's x axis: run seconds, or delivered Ah or Wh so far. */
export type ReadingAxis = 't' | 'ah' | 'wh';

/**
 * Readings of a whole run placed on the delivered-charge (`ah`) or delivered-energy (`wh`)
 * axis: each reading's x is the run's cumulative discharge at that reading (the core's
 * integrator over the archived elapsedSeconds/volts/amps columns). Returns the axis values.
 */
export function dischargeAxis(parts: readonly Columns[], axis: 'ah' | 'wh', maxGapSeconds?: number): { columns: Columns; x: Float64Array } {
  const all = concatColumns(parts);
  const e = all.elapsedSeconds ?? new Float64Array(0);
  const cum = cumulativeDischarge(e, all.volts ?? new Float64Array(e.length), all.amps ?? new Float64Array(e.length), maxGapSeconds);
  return { columns: all, x: axis === 'ah' ? cum.ah : cum.wh };
}

/**
 * Min/max buckets of a whole run over [from, to] on the delivered Ah or Wh axis (default 0 to
 * the delivered total). The axis never decreases, so the time reducer runs unchanged with the
 * axis in place of `elapsedSeconds`; `t` then holds axis positions and `bucketSeconds` the bucket
 * width in Ah or Wh.
 */
export function reduceOverDischarge(
  parts: readonly Columns[],
  axis: 'ah' | 'wh',
  window: { from?: number; to?: number },
  maxPoints: number,
  maxGapSeconds?: number,
): ReducedReadings & { from: number; to: number } {
  const { columns, x } = dischargeAxis(parts, axis, maxGapSeconds);
  const from = window.from ?? 0;
  const to = window.to ?? (x.length ? x[x.length - 1]! : 0);
  if (to < from) throw new RangeError('`to` must not be before `from`');
  return { from, to, ...reduceReadings([{ ...columns, elapsedSeconds: x }], from, to, maxPoints) };
}
