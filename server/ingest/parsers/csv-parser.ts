import type { CsvFormat } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { FieldSpans, splitPlain } from './csv-fields.js';
import { clip, reject, type LineParser, type ParseResult, type SpanParser } from './parse-result.js';
import { readDecimal } from './strict-number.js';
import { toAmps, toCelsius, toVolts } from './units.js';
import { MS_PER_S } from '../../../shared/units/time.js';

const CODE_0 = 48;
const CODE_9 = 57;
const CODE_DASH = 45;
const ISO_YEAR_DIGITS = 4;
const SKIPPED: ParseResult = Object.freeze({ kind: 'skipped' });

/** What a column carries, decided once per format rather than per line. */
const enum Use { Skip, Time, Volts, Amps, Seq, Temp, Aux }

/** A column of the format, compiled: what it carries and, for a channel, its name. */
interface Column {
  use: Use;
  name: string;
  label: string;
}

function compile(format: CsvFormat): Column[] {
  return format.columns.map((label) => {
    if (label === '-') return { use: Use.Skip, name: '', label };
    if (label === 't') return { use: Use.Time, name: '', label };
    if (label === 'volts') return { use: Use.Volts, name: '', label };
    if (label === 'amps') return { use: Use.Amps, name: '', label };
    if (label === 'seq') return { use: Use.Seq, name: '', label };
    if (label.startsWith('temp:')) return { use: Use.Temp, name: label.slice('temp:'.length), label };
    return { use: Use.Aux, name: label.slice('aux:'.length), label };
  });
}

/** Sets one channel as an own property, even one named like an Object.prototype member. */
function setChannel(target: Record<string, number>, name: string, value: number): void {
  if (name === '__proto__') Object.defineProperty(target, name, { value, enumerable: true, writable: true, configurable: true });
  else target[name] = value;
}

/**
 * The strict CSV line parser of live meters, compiled for one format. Fields are located
 * by a character scan into reused offsets and numbers read in place (readDecimal), so a
 * good line costs one Frame and nothing else. A line with the wrong field count or a
 * non-number in a used column is rejected with a reason naming the column.
 */
export class CsvLineParser {
  private readonly columns: Column[];
  private readonly spans = new FieldSpans();

  constructor(private readonly format: CsvFormat) {
    this.columns = compile(format);
  }

  /** Parses one line; `isFirstLine`, `seenFrame` and `arrivalMs` come from the caller. */
  parse(line: string, isFirstLine: boolean, arrivalMs: number, seenFrame: boolean): ParseResult {
    return this.parseSpan(line, 0, line.length, isFirstLine, arrivalMs, seenFrame);
  }

  /** Parses the line `line[lineStart, lineEnd)` in place (the framer's chunk text: no string per line). */
  parseSpan(line: string, lineStart: number, lineEnd: number, isFirstLine: boolean, arrivalMs: number, seenFrame: boolean): ParseResult {
    const { format, spans, columns } = this;
    splitPlain(line, format.delimiter, spans, lineStart, lineEnd);
    if (isFirstLine && format.header === 'skip-first') return SKIPPED;
    if (format.header === 'auto' && !seenFrame && this.looksLikeHeader(line)) return SKIPPED;
    if (spans.count !== columns.length) return reject(`expected ${columns.length} fields, got ${spans.count}`);
    let t = arrivalMs / MS_PER_S;
    let clock: Frame['clock'] = 'arrival';
    let volts = Number.NaN;
    let amps = Number.NaN;
    let seq: number | undefined;
    let temps: Record<string, number> | undefined;
    let aux: Record<string, number> | undefined;
    for (let i = 0; i < columns.length; i++) {
      const column = columns[i]!;
      if (column.use === Use.Skip) continue;
      const start = spans.starts[i]!;
      const end = spans.ends[i]!;
      if (column.use === Use.Time) {
        const seconds = this.timeSeconds(line, start, end);
        if (Number.isNaN(seconds)) return reject(`t: '${clip(line.slice(start, end))}' is not a time in ${format.timeUnit}`);
        t = seconds;
        clock = 'device';
        continue;
      }
      const value = readDecimal(line, start, end);
      if (Number.isNaN(value)) return reject(`${column.label}: '${clip(line.slice(start, end))}' is not a number`);
      switch (column.use) {
        case Use.Volts:
          volts = toVolts(value, format.voltsUnit);
          break;
        case Use.Amps:
          amps = toAmps(value, format.ampsUnit, format.currentSign);
          break;
        case Use.Seq:
          if (!Number.isInteger(value) || value < 0) return reject(`seq: '${clip(line.slice(start, end))}' is not a count`);
          seq = value;
          break;
        case Use.Temp:
          setChannel((temps ??= {}), column.name, toCelsius(value, format.tempUnit));
          break;
        default:
          setChannel((aux ??= {}), column.name, value);
      }
    }
    const frame: Frame = { t, volts, amps, clock };
    if (seq !== undefined) frame.seq = seq;
    if (temps !== undefined) frame.temps = temps;
    if (aux !== undefined) frame.aux = aux;
    return { kind: 'frame', frame };
  }

  /** Seconds from the time field (ISO dates: Unix seconds), NaN when it is not a time in the format's unit. */
  private timeSeconds(line: string, start: number, end: number): number {
    const unit = this.format.timeUnit;
    if (unit === 'iso') {
      const ms = Date.parse(line.slice(start, end));
      return Number.isFinite(ms) ? ms / MS_PER_S : Number.NaN;
    }
    const value = readDecimal(line, start, end);
    return unit === 'ms' ? value / MS_PER_S : value;
  }

  /** A header's first field is a word, not a number nor (for ISO time) a date. */
  private looksLikeHeader(line: string): boolean {
    const { spans, format } = this;
    const start = spans.count > 0 ? spans.starts[0]! : -1;
    const end = spans.count > 0 ? spans.ends[0]! : -1;
    if (format.columns[0] === 't' && format.timeUnit === 'iso') return !startsWithIsoYear(line, start, end);
    if (start >= end) return false;
    const c = line.charCodeAt(start);
    // A letter, an underscore or a quote: /^[A-Za-z_"']/.
    return (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95 || c === 34 || c === 39;
  }
}

/** `dddd-` at the start of the field: /^\d{4}-/. */
function startsWithIsoYear(line: string, start: number, end: number): boolean {
  if (end - start < ISO_YEAR_DIGITS + 1) return false;
  for (let i = start; i < start + ISO_YEAR_DIGITS; i++) {
    const c = line.charCodeAt(i);
    if (c < CODE_0 || c > CODE_9) return false;
  }
  return line.charCodeAt(start + ISO_YEAR_DIGITS) === CODE_DASH;
}

/**
 * Parses one CSV line against the column map. Pure: `isFirstLine`, `seenFrame` and
 * `arrivalMs` come from the caller; `auto` takes a wordy line as a header only before the
 * first frame (later it is a malformed line and counted). Compiles the format on each call:
 * a stream of lines goes through createCsvParser.
 */
export function parseCsvLine(format: CsvFormat, line: string, isFirstLine: boolean, arrivalMs: number, seenFrame = false): ParseResult {
  return new CsvLineParser(format).parse(line, isFirstLine, arrivalMs, seenFrame);
}

/** Makes a stateful parser of lines given in place, for a CSV format (it remembers the first line and the first frame). */
export function createCsvSpanParser(format: CsvFormat): SpanParser {
  const parser = new CsvLineParser(format);
  let first = true;
  let seenFrame = false;
  return (text, start, end, arrivalMs) => {
    const result = parser.parseSpan(text, start, end, first, arrivalMs, seenFrame);
    first = false;
    if (result.kind === 'frame') seenFrame = true;
    return result;
  };
}

/** Makes a stateful line parser for a CSV format (it remembers the first line and the first frame). */
export function createCsvParser(format: CsvFormat): LineParser {
  const parse = createCsvSpanParser(format);
  return (line, arrivalMs) => parse(line, 0, line.length, arrivalMs);
}
