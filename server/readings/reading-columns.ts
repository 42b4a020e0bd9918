import type { Frame } from '../../shared/schemas/frame.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { ReadingColumns, Topic } from '../../shared/schemas/ws.js';

/**
 * The one place readings become columns, for both sinks: the live hub sends them to
 * browsers as plain arrays (`toReadingColumns`), the archive stores them as Float64 columns
 * (`readingsToColumns`) and reads rows back (`readingAt`). One channel walk serves both.
 */

/** Named Float64 columns of equal length (the archive's unit of storage). */
export type Columns = Record<string, Float64Array>;

/** A bench frame or a run reading; run readings carry totals and their run time. */
export type LiveReading = Frame | Reading;

/**
 * Fixed channels every stored reading has; temperatures and aux channels add `temp:`/`aux:` columns.
 * These are the names inside archive blocks written from now on: `elapsedSeconds` is the run
 * time (s) and `t` the source time (the meter's own clock). Blocks stored before the rename
 * name the run time `elapsed`; the archive maps it when it decodes (server/archive/column-block.ts).
 */
export const BASE_COLUMNS = ['t', 'elapsedSeconds', 'volts', 'amps', 'dischargeWh', 'dischargeAh', 'chargeWh', 'chargeAh'] as const;
/** Prefix of a stored temperature column (`temp:cell`). */
export const TEMP_PREFIX = 'temp:';
/** Prefix of a stored auxiliary column (`aux:soc`). */
export const AUX_PREFIX = 'aux:';

const isReading = (s: LiveReading): s is Reading => 'elapsedSeconds' in s;

/** Every channel name of one kind (temps or aux) that any of the readings at `idx` has, in first-seen order. */
function channelsOf(readings: readonly LiveReading[], idx: Iterable<number>, kind: 'temps' | 'aux'): string[] {
  const channels = new Set<string>();
  for (const i of idx) {
    const s = readings[i]!;
    const values = kind === 'temps' ? s.temps : s.aux;
    if (values) for (const ch of Object.keys(values)) channels.add(ch);
  }
  return [...channels];
}

const allIndices = (n: number): number[] => Array.from({ length: n }, (_, i) => i);

/**
 * Columns of the readings at `indices` (all when omitted), in the WebSocket's shape. A run
 * topic's time column is `elapsedSeconds` (run time) and its totals are included; a bench
 * topic's is `t` (the frame's source time). The topic decides, so an empty batch has the right one.
 */
export function toReadingColumns(topicKind: Topic['kind'], readings: readonly LiveReading[], indices?: readonly number[]): ReadingColumns {
  const idx = indices ?? allIndices(readings.length);
  const withTotals = readings.length > 0 && isReading(readings[0]!);
  const time: number[] = [];
  const base = { volts: [] as number[], amps: [] as number[], watts: [] as number[], temps: {} as Record<string, (number | null)[]> };
  const cols: ReadingColumns = topicKind === 'run' ? { elapsedSeconds: time, ...base } : { t: time, ...base };
  if (withTotals) Object.assign(cols, { dischargeWh: [], dischargeAh: [], chargeWh: [], chargeAh: [] });
  const channels = channelsOf(readings, idx, 'temps');
  for (const ch of channels) cols.temps[ch] = [];
  for (const i of idx) {
    const s = readings[i]!;
    time.push(topicKind === 'run' && isReading(s) ? s.elapsedSeconds : s.t);
    cols.volts.push(s.volts);
    cols.amps.push(s.amps);
    cols.watts.push(s.volts * s.amps);
    for (const ch of channels) cols.temps[ch]!.push(s.temps?.[ch] ?? null);
    if (withTotals && isReading(s)) {
      cols.dischargeWh!.push(s.dischargeWh);
      cols.dischargeAh!.push(s.dischargeAh);
      cols.chargeWh!.push(s.chargeWh);
      cols.chargeAh!.push(s.chargeAh);
    }
  }
  return cols;
}

/** Turns readings into Float64 columns for storage; a channel a reading lacks is NaN in that row. */
export function readingsToColumns(readings: readonly Reading[]): Columns {
  const n = readings.length;
  const cols: Columns = {};
  for (const name of BASE_COLUMNS) cols[name] = new Float64Array(n);
  const idx = allIndices(n);
  const temps = channelsOf(readings, idx, 'temps').map((ch) => [ch, (cols[TEMP_PREFIX + ch] = new Float64Array(n).fill(Number.NaN))] as const);
  const aux = channelsOf(readings, idx, 'aux').map((ch) => [ch, (cols[AUX_PREFIX + ch] = new Float64Array(n).fill(Number.NaN))] as const);
  for (let i = 0; i < n; i++) {
    const r = readings[i]!;
    cols.t![i] = r.t;
    cols.elapsedSeconds![i] = r.elapsedSeconds;
    cols.volts![i] = r.volts;
    cols.amps![i] = r.amps;
    cols.dischargeWh![i] = r.dischargeWh;
    cols.dischargeAh![i] = r.dischargeAh;
    cols.chargeWh![i] = r.chargeWh;
    cols.chargeAh![i] = r.chargeAh;
    if (r.temps) for (const [ch, col] of temps) col[i] = r.temps[ch] ?? Number.NaN;
    if (r.aux) for (const [ch, col] of aux) col[i] = r.aux[ch] ?? Number.NaN;
  }
  return cols;
}

/** Rebuilds reading row `i` from stored columns (NaN channels are left out). */
export function readingAt(cols: Columns, i: number): Reading {
  const temps: Record<string, number> = {};
  const aux: Record<string, number> = {};
  for (const [name, col] of Object.entries(cols)) {
    const v = col[i]!;
    if (Number.isNaN(v)) continue;
    if (name.startsWith(TEMP_PREFIX)) temps[name.slice(TEMP_PREFIX.length)] = v;
    else if (name.startsWith(AUX_PREFIX)) aux[name.slice(AUX_PREFIX.length)] = v;
  }
  const volts = cols.volts![i]!;
  const amps = cols.amps![i]!;
  return {
    t: cols.t![i]!,
    elapsedSeconds: cols.elapsedSeconds![i]!,
    volts,
    amps,
    watts: volts * amps,
    dischargeWh: cols.dischargeWh![i]!,
    dischargeAh: cols.dischargeAh![i]!,
    chargeWh: cols.chargeWh![i]!,
    chargeAh: cols.chargeAh![i]!,
    clock: 'device',
    ...(Object.keys(temps).length ? { temps } : {}),
    ...(Object.keys(aux).length ? { aux } : {}),
  };
}
