import type { Frame } from '../schemas/frame.js';

/** Where each quantity sits in a delimited line (0-based column indexes). */
export interface CsvLayout {
  t: number;
  volts: number;
  amps: number;
  /** Temperature channels by name → column. */
  temps?: Readonly<Record<string, number>>;
  /** Auxiliary channels (e.g. heaterAmps) by name → column. */
  aux?: Readonly<Record<string, number>>;
  /** −1 when the source logs discharge as negative amps (Kneepoint counts discharge positive). */
  ampsSign?: 1 | -1;
  delimiter?: string;
  clock?: Frame['clock'];
}

/** `t,volts,amps` with device time. */
export const DEFAULT_CSV_LAYOUT: CsvLayout = { t: 0, volts: 1, amps: 2 };

/** A parsed line, or why it was refused (the caller counts refusals; nothing throws). */
export type CsvLineResult = { ok: true; frame: Frame } | { ok: false; error: string };

function field(cells: string[], index: number, name: string): number | string {
  const raw = cells[index];
  if (raw === undefined) return `missing column ${index + 1} (${name})`;
  const trimmed = raw.trim();
  // Number('') is 0: an empty cell must be refused, not read as zero volts.
  const value = trimmed === '' ? Number.NaN : Number(trimmed);
  return Number.isFinite(value) ? value : `column ${index + 1} (${name}) is not a finite number: ${JSON.stringify(raw.slice(0, 40))}`;
}

function channels(cells: string[], map: Readonly<Record<string, number>> | undefined): Record<string, number> | string | undefined {
  if (!map) return undefined;
  const out: Record<string, number> = {};
  for (const name in map) {
    const v = field(cells, map[name]!, name);
    if (typeof v === 'string') return v;
    out[name] = v;
  }
  return out;
}

/** Parses one delimited text line (no quoting: meters write plain numbers) into a Frame. */
export function parseCsvLine(line: string, layout: CsvLayout = DEFAULT_CSV_LAYOUT): CsvLineResult {
  const cells = line.split(layout.delimiter ?? ',');
  const t = field(cells, layout.t, 't');
  if (typeof t === 'string') return { ok: false, error: t };
  const volts = field(cells, layout.volts, 'volts');
  if (typeof volts === 'string') return { ok: false, error: volts };
  const amps = field(cells, layout.amps, 'amps');
  if (typeof amps === 'string') return { ok: false, error: amps };
  const temps = channels(cells, layout.temps);
  if (typeof temps === 'string') return { ok: false, error: temps };
  const aux = channels(cells, layout.aux);
  if (typeof aux === 'string') return { ok: false, error: aux };
  const frame: Frame = { t, volts, amps: amps * (layout.ampsSign ?? 1), clock: layout.clock ?? 'device' };
  if (temps) frame.temps = temps;
  if (aux) frame.aux = aux;
  return { ok: true, frame };
}
