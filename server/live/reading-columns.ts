import type { Frame } from '../../shared/schemas/frame.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { ReadingColumns } from '../../shared/schemas/ws.js';

/** A bench frame or a run reading; run readings carry totals and their run time. */
export type LiveReading = Frame | Reading;

const isReading = (s: LiveReading): s is Reading => 'elapsedSeconds' in s;

/**
 * Columns of the samples at `indices` (all when omitted), in the WebSocket's shape. For
 * run readings `t` is the run time and the totals are included.
 */
export function toReadingColumns(samples: readonly LiveReading[], indices?: readonly number[]): ReadingColumns {
  const idx = indices ?? samples.map((_, i) => i);
  const withTotals = samples.length > 0 && isReading(samples[0]!);
  const cols: ReadingColumns = { t: [], volts: [], amps: [], watts: [], temps: {} };
  if (withTotals) Object.assign(cols, { dischargeWh: [], dischargeAh: [], chargeWh: [], chargeAh: [] });
  const channels = new Set<string>();
  for (const i of idx) for (const ch of Object.keys(samples[i]!.temps ?? {})) channels.add(ch);
  for (const ch of channels) cols.temps[ch] = [];
  for (const i of idx) {
    const s = samples[i]!;
    cols.t.push(isReading(s) ? s.elapsedSeconds : s.t);
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
