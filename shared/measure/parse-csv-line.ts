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

/** Column boundaries of the line being parsed: one scratch buffer, grown on demand (no per-line split). */
let bounds = new Int32Array(64);
let columnCount = 0;

function scan(line: string, delimiter: string): void {
  let from = 0;
  columnCount = 0;
  for (;;) {
    if (columnCount * 2 + 2 > bounds.length) {
      const bigger = new Int32Array(bounds.length * 2);
      bigger.set(bounds);
      bounds = bigger;
    }
    const at = line.indexOf(delimiter, from);
    bounds[columnCount * 2] = from;
    bounds[columnCount * 2 + 1] = at === -1 ? line.length : at;
    columnCount++;
    if (at === -1) return;
    from = at + delimiter.length;
  }
}

/** Exact powers of ten: 10^k is a double without rounding up to k = 22. */
const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);
/** Digits a mantissa may have and still be an exact integer double (< 2^53). */
const MAX_EXACT_DIGITS = 15;
const CODE_0 = 48;
const CODE_9 = 57;
const CODE_DOT = 46;
const CODE_MINUS = 45;
const CODE_PLUS = 43;

/**
 * Plain decimals ("-12.3456") without allocating: with at most 15 digits the mantissa and
 * 10^k are exact doubles, so one division is correctly rounded and equals Number(text)
 * (Clinger's fast path). Anything else (exponents, spaces, long numbers) goes to Number().
 */
function fastDecimal(line: string, from: number, to: number): number {
  let i = from;
  let negative = false;
  const first = line.charCodeAt(i);
  if (first === CODE_MINUS || first === CODE_PLUS) {
    negative = first === CODE_MINUS;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let fraction = -1;
  for (; i < to; i++) {
    const c = line.charCodeAt(i);
    if (c >= CODE_0 && c <= CODE_9) {
      mantissa = mantissa * 10 + (c - CODE_0);
      digits++;
    } else if (c === CODE_DOT && fraction < 0) {
      fraction = digits;
    } else {
      return Number.NaN; // not a plain decimal: let Number() decide
    }
  }
  if (digits === 0 || digits > MAX_EXACT_DIGITS) return Number.NaN;
  const value = fraction < 0 ? mantissa : mantissa / POW10[digits - fraction]!;
  return negative ? -value : value;
}

/** The number in a column, or NaN when missing, empty or not numeric (Number('') would be 0). */
function numberAt(line: string, index: number): number {
  if (index >= columnCount) return Number.NaN;
  const from = bounds[index * 2]!;
  const to = bounds[index * 2 + 1]!;
  const fast = fastDecimal(line, from, to);
  if (!Number.isNaN(fast)) return fast;
  const text = line.slice(from, to);
  const value = Number(text);
  return value === 0 && text.trim() === '' ? Number.NaN : value;
}

function describe(line: string, index: number, name: string): string {
  if (index >= columnCount) return `missing column ${index + 1} (${name})`;
  const raw = line.slice(bounds[index * 2]!, bounds[index * 2 + 1]!);
  return `column ${index + 1} (${name}) is not a finite number: ${JSON.stringify(raw.slice(0, 40))}`;
}

function channels(line: string, map: Readonly<Record<string, number>> | undefined): Record<string, number> | string | undefined {
  if (!map) return undefined;
  const out: Record<string, number> = {};
  for (const name in map) {
    const v = numberAt(line, map[name]!);
    if (!Number.isFinite(v)) return describe(line, map[name]!, name);
    out[name] = v;
  }
  return out;
}

/** Parses one delimited text line (no quoting: meters write plain numbers) into a Frame. */
export function parseCsvLine(line: string, layout: CsvLayout = DEFAULT_CSV_LAYOUT): CsvLineResult {
  scan(line, layout.delimiter ?? ',');
  const t = numberAt(line, layout.t);
  if (!Number.isFinite(t)) return { ok: false, error: describe(line, layout.t, 't') };
  const volts = numberAt(line, layout.volts);
  if (!Number.isFinite(volts)) return { ok: false, error: describe(line, layout.volts, 'volts') };
  const amps = numberAt(line, layout.amps);
  if (!Number.isFinite(amps)) return { ok: false, error: describe(line, layout.amps, 'amps') };
  const temps = channels(line, layout.temps);
  if (typeof temps === 'string') return { ok: false, error: temps };
  const aux = channels(line, layout.aux);
  if (typeof aux === 'string') return { ok: false, error: aux };
  const frame: Frame = { t, volts, amps: amps * (layout.ampsSign ?? 1), clock: layout.clock ?? 'device' };
  if (temps) frame.temps = temps;
  if (aux) frame.aux = aux;
  return { ok: true, frame };
}
