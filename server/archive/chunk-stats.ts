import type { Columns } from './column-block.js';
import { TEMP_PREFIX } from '../readings/reading-columns.js';

/** Readings per pre-computed min/max group (6.4 s at 10 Hz). */
export const STATS_GROUP_READINGS = 64;

/**
 * Min/max of every chart channel per group of STATS_GROUP_READINGS readings, kept beside
 * each chunk, so a chart of a long run reads kilobytes instead of inflating every reading.
 * Columns: `start`, `end` (run seconds), `n`, then `<channel>:min` / `<channel>:max` for
 * volts, amps, watts and each `temp:<name>`.
 */
export function computeStats(cols: Columns, groupSize = STATS_GROUP_READINGS): Columns {
  const e = cols.elapsedSeconds!;
  const n = e.length;
  const groups = Math.ceil(n / groupSize);
  const channels: [string, (i: number) => number][] = [
    ['volts', (i) => cols.volts![i]!],
    ['amps', (i) => cols.amps![i]!],
    ['watts', (i) => cols.volts![i]! * cols.amps![i]!],
  ];
  for (const name of Object.keys(cols)) if (name.startsWith(TEMP_PREFIX)) channels.push([name, (i) => cols[name]![i]!]);
  const out: Columns = { start: new Float64Array(groups), end: new Float64Array(groups), n: new Float64Array(groups) };
  for (const [name] of channels) {
    out[`${name}:min`] = new Float64Array(groups).fill(Number.NaN);
    out[`${name}:max`] = new Float64Array(groups).fill(Number.NaN);
  }
  for (let g = 0; g < groups; g++) {
    const from = g * groupSize;
    const to = Math.min(n, from + groupSize);
    out.start![g] = e[from]!;
    out.end![g] = e[to - 1]!;
    out.n![g] = to - from;
    for (const [name, get] of channels) {
      let lo = Number.POSITIVE_INFINITY;
      let hi = Number.NEGATIVE_INFINITY;
      for (let i = from; i < to; i++) {
        const v = get(i);
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      // A channel missing from the whole group (NaN comparisons fail) stays NaN.
      if (lo !== Number.POSITIVE_INFINITY) out[`${name}:min`]![g] = lo;
      if (hi !== Number.NEGATIVE_INFINITY) out[`${name}:max`]![g] = hi;
    }
  }
  return out;
}
