import type { Reading } from '../../shared/schemas/reading.js';
import type { Columns } from './column-block.js';

/** Fixed channels every stored reading has; temperatures and aux channels add `temp:`/`aux:` columns. */
export const BASE_COLUMNS = ['t', 'elapsed', 'volts', 'amps', 'dischargeWh', 'dischargeAh', 'chargeWh', 'chargeAh'] as const;
export const TEMP_PREFIX = 'temp:';
export const AUX_PREFIX = 'aux:';

/** Turns readings into Float64 columns; a channel a reading lacks is NaN in that row. */
export function readingsToColumns(readings: readonly Reading[]): Columns {
  const n = readings.length;
  const cols: Columns = {};
  for (const name of BASE_COLUMNS) cols[name] = new Float64Array(n);
  const extra = (name: string): Float64Array => {
    let col = cols[name];
    if (!col) {
      col = new Float64Array(n).fill(Number.NaN);
      cols[name] = col;
    }
    return col;
  };
  for (let i = 0; i < n; i++) {
    const r = readings[i]!;
    cols.t![i] = r.t;
    cols.elapsed![i] = r.elapsedSeconds;
    cols.volts![i] = r.volts;
    cols.amps![i] = r.amps;
    cols.dischargeWh![i] = r.dischargeWh;
    cols.dischargeAh![i] = r.dischargeAh;
    cols.chargeWh![i] = r.chargeWh;
    cols.chargeAh![i] = r.chargeAh;
    if (r.temps) for (const [ch, v] of Object.entries(r.temps)) extra(TEMP_PREFIX + ch)[i] = v;
    if (r.aux) for (const [ch, v] of Object.entries(r.aux)) extra(AUX_PREFIX + ch)[i] = v;
  }
  return cols;
}

/** Concatenates column sets in order; a column absent from one part is NaN there. */
export function concatColumns(parts: readonly Columns[]): Columns {
  const total = parts.reduce((sum, p) => sum + columnLength(p), 0);
  const names = new Set<string>();
  for (const p of parts) for (const k of Object.keys(p)) names.add(k);
  const out: Columns = {};
  for (const name of names) out[name] = new Float64Array(total).fill(Number.NaN);
  let at = 0;
  for (const p of parts) {
    for (const [name, col] of Object.entries(p)) out[name]!.set(col, at);
    at += columnLength(p);
  }
  return out;
}

/** Number of rows in a column set. */
export function columnLength(cols: Columns): number {
  const first = Object.values(cols)[0];
  return first ? first.length : 0;
}

/** Rebuilds reading row `i` from columns (NaN channels are left out). */
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
    elapsedSeconds: cols.elapsed![i]!,
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
