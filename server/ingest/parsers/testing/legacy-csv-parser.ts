// The CSV line parser as it was before the one-parser rewrite (split, trim, regexes): kept only as
// the oracle that csv-parser.property.test.ts compares the fast parser with, reason for reason.
import type { CsvFormat } from '../../../../shared/schemas/bench.js';
import type { Frame } from '../../../../shared/schemas/frame.js';
import { clip, reject, type LineParser, type ParseResult } from '../parse-result.js';
import { parseStrictNumber, timeToSeconds, toAmps, toCelsius, toVolts } from './legacy-units.js';

const MS_PER_S = 1000; // vocab-rename: keep (the oracle keeps its own constants as they were)

/**
 * Parses one CSV line against the column map. Pure: `isFirstLine`, `seenFrame` and
 * `arrivalMs` come from the caller; `auto` takes a wordy line as a header only before the
 * first frame (later it is a malformed line and counted). A line with the wrong field count or a non-number in a used column is
 * rejected with a reason naming the column.
 */
export function legacyParseCsvLine(
  format: CsvFormat,
  line: string,
  isFirstLine: boolean,
  arrivalMs: number,
  seenFrame = false,
): ParseResult {
  const fields = line.split(format.delimiter === ' ' ? /\s+/ : format.delimiter).map((f) => f.trim());
  if (format.delimiter === ' ' && fields[0] === '') fields.shift();
  if (isFirstLine && format.header === 'skip-first') return { kind: 'skipped' };
  if (format.header === 'auto' && !seenFrame && looksLikeHeader(fields[0] ?? '', format)) return { kind: 'skipped' };
  if (fields.length !== format.columns.length) {
    return reject(`expected ${format.columns.length} fields, got ${fields.length}`);
  }
  const frame: Frame = { t: arrivalMs / MS_PER_S, volts: NaN, amps: NaN, clock: 'arrival' };
  for (let i = 0; i < format.columns.length; i++) {
    const column = format.columns[i]!;
    if (column === '-') continue;
    const raw = fields[i]!;
    if (column === 't') {
      const t = timeToSeconds(raw, format.timeUnit);
      if (t === undefined) return reject(`t: '${clip(raw)}' is not a time in ${format.timeUnit}`);
      frame.t = t;
      frame.clock = 'device';
      continue;
    }
    const value = parseStrictNumber(raw);
    if (value === undefined) return reject(`${column}: '${clip(raw)}' is not a number`);
    applyColumn(frame, column, value, format);
    if (column === 'seq' && (!Number.isInteger(value) || value < 0)) return reject(`seq: '${clip(raw)}' is not a count`);
  }
  return { kind: 'frame', frame };
}

/** Makes a stateful line parser for a CSV format (it remembers the first line and the first frame). */
export function legacyCreateCsvParser(format: CsvFormat): LineParser {
  let first = true;
  let seenFrame = false;
  return (line, arrivalMs) => {
    const result = legacyParseCsvLine(format, line, first, arrivalMs, seenFrame);
    first = false;
    if (result.kind === 'frame') seenFrame = true;
    return result;
  };
}

function applyColumn(frame: Frame, column: string, value: number, format: CsvFormat): void {
  if (column === 'volts') frame.volts = toVolts(value, format.voltsUnit);
  else if (column === 'amps') frame.amps = toAmps(value, format.ampsUnit, format.currentSign);
  else if (column === 'seq') frame.seq = value;
  else if (column.startsWith('temp:')) {
    frame.temps = { ...frame.temps, [column.slice('temp:'.length)]: toCelsius(value, format.tempUnit) };
  } else if (column.startsWith('aux:')) frame.aux = { ...frame.aux, [column.slice('aux:'.length)]: value };
}

/** A header's first field is a word, not a number nor (for ISO time) a date. */
function looksLikeHeader(firstField: string, format: CsvFormat): boolean {
  if (format.columns[0] === 't' && format.timeUnit === 'iso') return !/^\d{4}-/.test(firstField);
  return /^[A-Za-z_"']/.test(firstField);
}
