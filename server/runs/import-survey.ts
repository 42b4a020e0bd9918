import { InvalidInputError } from '../domain/domain-errors.js';
import { readCsvRecords, type Delimiter } from './import-csv.js';
import { createRowParser, planColumns, type ColumnOverrides, type ColumnPlan } from './import-headers.js';
import { createSignTally, tallyReading, type SignTally } from './import-sign.js';
import { checkTimeSteps } from './import-time.js';
import { checkAssumedTempUnit } from './import-temp-check.js';
import { KeptRows } from './kept-rows.js';

/** Lines of duplicate times named in the result; the count covers them all. */
export const MAX_NAMED_DUPLICATES = 10;
/** Steps are counted to the microsecond for the median (finer than any logger's clock). */
const STEP_RESOLUTION_S = 1e-6;

/** Rows whose time repeats the row before: the integrator keeps the first and drops these. */
export interface DuplicateTimes {
  count: number;
  /** The first MAX_NAMED_DUPLICATES line numbers. */
  lines: number[];
}

/** What pass 1 learned of a file, holding nothing but counts. */
export interface Survey {
  plan: ColumnPlan;
  rows: number;
  duplicates: DuplicateTimes;
  /** Median step between distinct times, seconds: the file's cadence. */
  medianStepSeconds: number | null;
  firstT: number;
  lastT: number;
  sign: SignTally;
  /** Every parsed row, when they fit the memory budget (null otherwise): the import pass uses them instead of reading again. */
  kept: KeptRows | null;
}

/** Median of counted steps (keys in microseconds), or null when there are none. */
export function medianOfCounts(counts: ReadonlyMap<number, number>): number | null {
  let total = 0;
  for (const c of counts.values()) total += c;
  if (total === 0) return null;
  const keys = [...counts.keys()].sort((a, b) => a - b);
  // Lower median: with an even count the smaller middle step (a cadence that exists in the file).
  let seen = 0;
  const middle = Math.ceil(total / 2);
  for (const k of keys) {
    seen += counts.get(k)!;
    if (seen >= middle) return k * STEP_RESOLUTION_S;
  }
  return null;
}

/**
 * Pass 1: check every row, count duplicate times, learn the cadence and the energy each way
 * of the current. Refuses (400, naming the line) a row out of time order or a time column
 * whose steps cannot be the unit claimed.
 */
export async function surveyFile(filePath: string, delimiter: Delimiter, overrides: ColumnOverrides, timeZone: string, onProgress?: (rows: number) => void, maxKeptRows?: number): Promise<Survey> {
  let headers: string[] | null = null as string[] | null;
  let plan: ColumnPlan | null = null;
  let parse: ReturnType<typeof createRowParser> | null = null;
  let rows = 0;
  let firstT = Number.NaN;
  let lastT = Number.NEGATIVE_INFINITY;
  const duplicates: DuplicateTimes = { count: 0, lines: [] };
  const steps = new Map<number, number>();
  const sign = createSignTally();
  const kept = new KeptRows(maxKeptRows);
  let firstTempCelsius: number | null = null;
  const makePlan = (first: string[] | null) => ({ ...planColumns(headers!, first, overrides), decimalComma: delimiter !== ',', timeZone });
  await readCsvRecords(filePath, delimiter, (text, spans, line) => {
    if (!headers) {
      headers = spans.texts(text);
      return;
    }
    plan ??= makePlan(spans.texts(text));
    parse ??= createRowParser(plan);
    const row = parse(text, spans, line);
    // Out-of-order rows would be dropped by the integrator: refuse the file rather than lose them quietly.
    if (row.t < lastT) throw new InvalidInputError(`line ${line}: time goes back (${row.t} s after ${lastT} s); rows must be in time order`);
    if (row.t === lastT) {
      duplicates.count++;
      if (duplicates.lines.length < MAX_NAMED_DUPLICATES) duplicates.lines.push(line);
    } else if (rows > 0) {
      const key = Math.round((row.t - lastT) / STEP_RESOLUTION_S);
      steps.set(key, (steps.get(key) ?? 0) + 1);
    }
    tallyReading(sign, rows > 0 ? row.t - lastT : 0, row.volts, row.amps);
    firstTempCelsius ??= row.tempCelsius;
    kept.add(row);
    if (rows === 0) firstT = row.t;
    lastT = row.t;
    rows++;
  }, async () => onProgress?.(rows));
  if (!headers) throw new InvalidInputError('line 1: the file is empty; expected a header row');
  // A header alone (or a file that is no CSV) is reported by what is wrong with its header first.
  plan ??= makePlan(null);
  if (rows < 2) throw new InvalidInputError(`line ${rows + 2}: at least two readings are needed after the header`);
  const medianStepSeconds = medianOfCounts(steps);
  if (plan.temp && firstTempCelsius !== null) checkAssumedTempUnit(plan.temp, firstTempCelsius);
  checkTimeSteps({ format: plan.time.format, source: plan.time.source, column: plan.time.column, medianStepSeconds, spanSeconds: lastT - firstT });
  return { plan, rows, duplicates, medianStepSeconds, firstT, lastT, sign, kept: kept.full ? null : kept };
}
