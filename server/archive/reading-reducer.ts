import type { Columns } from './column-block.js';
import { TEMP_PREFIX } from '../readings/reading-columns.js';

/** One channel reduced: min and max per bucket (null for an empty bucket: a gap, never a line). */
export interface MinMax {
  min: (number | null)[];
  max: (number | null)[];
}
export interface ReducedReadings {
  reduced: boolean;
  bucketSeconds: number | null;
  readingsInWindow: number;
  t: number[];
  volts: MinMax;
  amps: MinMax;
  watts: MinMax;
  temps: Record<string, MinMax>;
}

/** First index in a sorted column whose value is >= x. */
function lowerBound(col: Float64Array, x: number): number {
  let lo = 0;
  let hi = col.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (col[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index in a sorted column whose value is > x. */
function upperBound(col: Float64Array, x: number): number {
  let lo = 0;
  let hi = col.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (col[mid]! <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Bucket extremes while reducing: typed arrays (fast), +/-Infinity meaning "empty so far". */
interface Acc {
  min: Float64Array;
  max: Float64Array;
}
const emptyAcc = (n: number): Acc => ({ min: new Float64Array(n).fill(Infinity), max: new Float64Array(n).fill(-Infinity) });
const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

function put(mm: Acc, b: number, v: number): void {
  // NaN (a channel missing in this reading) fails both comparisons and changes nothing.
  if (v < mm.min[b]!) mm.min[b] = v;
  if (v > mm.max[b]!) mm.max[b] = v;
}

/** The API's shape: an empty bucket becomes null. */
function toMinMax(acc: Acc): MinMax {
  return { min: Array.from(acc.min, finiteOrNull), max: Array.from(acc.max, finiteOrNull) };
}
const accRecord = (r: Record<string, Acc>): Record<string, MinMax> => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, toMinMax(v)]));

/**
 * Reduces time-ordered column parts (each with `elapsedSeconds`, `volts`, `amps`, optional
 * `temp:*`) over [from, to] to at most `maxPoints` min/max buckets. When the window
 * holds no more readings than `maxPoints`, every reading is returned as it is. A spike
 * survives because a bucket keeps its extremes, never an average.
 */
export function reduceReadings(parts: readonly Columns[], from: number, to: number, maxPoints: number): ReducedReadings {
  const ranges = parts.map((p) => {
    const e = p.elapsedSeconds!;
    return { p, start: lowerBound(e, from), end: upperBound(e, to) };
  });
  const inWindow = ranges.reduce((s, r) => s + Math.max(0, r.end - r.start), 0);
  const tempNames = new Set<string>();
  for (const p of parts) for (const k of Object.keys(p)) if (k.startsWith(TEMP_PREFIX)) tempNames.add(k);

  if (inWindow <= maxPoints) {
    const t: number[] = [];
    const cols = { volts: [] as (number | null)[], amps: [] as (number | null)[], watts: [] as (number | null)[] };
    const temps: Record<string, (number | null)[]> = {};
    for (const name of tempNames) temps[name] = [];
    for (const { p, start, end } of ranges) {
      for (let i = start; i < end; i++) {
        const v = p.volts![i]!;
        const a = p.amps![i]!;
        t.push(p.elapsedSeconds![i]!);
        cols.volts.push(finiteOrNull(v));
        cols.amps.push(finiteOrNull(a));
        cols.watts.push(finiteOrNull(v * a));
        for (const name of tempNames) temps[name]!.push(p[name] ? finiteOrNull(p[name][i]!) : null);
      }
    }
    const same = (c: (number | null)[]): MinMax => ({ min: c, max: c });
    const tempOut: Record<string, MinMax> = {};
    for (const [name, c] of Object.entries(temps)) tempOut[name.slice(TEMP_PREFIX.length)] = same(c);
    return {
      reduced: false,
      bucketSeconds: null,
      readingsInWindow: inWindow,
      t,
      volts: same(cols.volts),
      amps: same(cols.amps),
      watts: same(cols.watts),
      temps: tempOut,
    };
  }

  const buckets = maxPoints;
  const { bucketSeconds, t, volts, amps, watts, temps } = emptyBuckets(from, to, buckets);
  for (const name of tempNames) temps[name.slice(TEMP_PREFIX.length)] = emptyAcc(buckets);
  for (const { p, start, end } of ranges) {
    const e = p.elapsedSeconds!;
    const vCol = p.volts!;
    const aCol = p.amps!;
    const tempCols = [...tempNames].filter((n) => p[n]).map((n) => [temps[n.slice(TEMP_PREFIX.length)]!, p[n]!] as const);
    for (let i = start; i < end; i++) {
      // The last reading sits exactly on `to`: keep it in the last bucket.
      const b = Math.min(buckets - 1, Math.floor((e[i]! - from) / bucketSeconds));
      const v = vCol[i]!;
      const a = aCol[i]!;
      put(volts, b, v);
      put(amps, b, a);
      put(watts, b, v * a);
      for (const [mm, col] of tempCols) put(mm, b, col[i]!);
    }
  }
  return { reduced: true, bucketSeconds, readingsInWindow: inWindow, t, volts: toMinMax(volts), amps: toMinMax(amps), watts: toMinMax(watts), temps: accRecord(temps) };
}

/** Empty min/max buckets of equal width over [from, to], with each bucket's start time. */
function emptyBuckets(from: number, to: number, buckets: number) {
  const bucketSeconds = (to - from) / buckets;
  return {
    bucketSeconds,
    t: Array.from({ length: buckets }, (_, b) => from + b * bucketSeconds),
    volts: emptyAcc(buckets),
    amps: emptyAcc(buckets),
    watts: emptyAcc(buckets),
    temps: {} as Record<string, Acc>,
  };
}

/**
 * The same min/max buckets built from pre-computed groups (chunk-stats.ts) instead of
 * every reading, for windows holding far more readings than buckets. A group that
 * straddles a bucket border counts in both buckets, so an extreme is never lost; the
 * bucket it lands in is off by at most one group's duration.
 */
export function reduceStats(parts: readonly Columns[], from: number, to: number, buckets: number): ReducedReadings {
  const { bucketSeconds, t, volts, amps, watts, temps } = emptyBuckets(from, to, buckets);
  let inWindow = 0;
  const bucketOf = (x: number) => Math.max(0, Math.min(buckets - 1, Math.floor((x - from) / bucketSeconds)));
  for (const p of parts) {
    const targets: [Acc, Float64Array, Float64Array][] = [
      [volts, p['volts:min']!, p['volts:max']!],
      [amps, p['amps:min']!, p['amps:max']!],
      [watts, p['watts:min']!, p['watts:max']!],
    ];
    for (const name of Object.keys(p)) {
      if (!name.startsWith(TEMP_PREFIX) || !name.endsWith(':min')) continue;
      const ch = name.slice(TEMP_PREFIX.length, -':min'.length);
      temps[ch] ??= emptyAcc(buckets);
      targets.push([temps[ch], p[name]!, p[`${TEMP_PREFIX}${ch}:max`]!]);
    }
    const start = p.start!;
    const end = p.end!;
    for (let g = 0; g < start.length; g++) {
      if (end[g]! < from || start[g]! > to) continue;
      inWindow += p.n![g]!;
      const b0 = bucketOf(start[g]!);
      const b1 = bucketOf(end[g]!);
      for (let b = b0; b <= b1; b++) {
        for (const [mm, lo, hi] of targets) {
          put(mm, b, lo[g]!);
          put(mm, b, hi[g]!);
        }
      }
    }
  }
  return { reduced: true, bucketSeconds, readingsInWindow: inWindow, t, volts: toMinMax(volts), amps: toMinMax(amps), watts: toMinMax(watts), temps: accRecord(temps) };
}
