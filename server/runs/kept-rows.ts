import type { ParsedRow } from './import-headers.js';

/** Rows the check pass keeps for the import pass: 4 columns × 8 bytes, so 2 M rows take 64 MB outside the JS heap. */
export const MAX_KEPT_ROWS = 2_000_000;
const INITIAL_ROWS = 1 << 16;
const COLUMNS = 4;

/**
 * The parsed rows of a log in columns (t, volts, amps, °C with NaN for "not measured"), kept
 * by the check pass so the import pass need not read and parse the file again. Beyond
 * MAX_KEPT_ROWS it gives up (`full`), and the import pass reads the file as before.
 */
export class KeptRows {
  private data = new Float64Array(INITIAL_ROWS * COLUMNS);
  count = 0;
  full = false;

  constructor(private readonly maxRows = MAX_KEPT_ROWS) {}

  /** Keeps one row (or notes that the budget is spent). */
  add(row: ParsedRow): void {
    if (this.full) return;
    if (this.count >= this.maxRows) {
      this.full = true;
      this.data = new Float64Array(0);
      return;
    }
    if ((this.count + 1) * COLUMNS > this.data.length) {
      const bigger = new Float64Array(Math.max((this.count + 1) * COLUMNS, Math.min(this.data.length * 2, this.maxRows * COLUMNS)));
      bigger.set(this.data);
      this.data = bigger;
    }
    const at = this.count * COLUMNS;
    this.data[at] = row.t;
    this.data[at + 1] = row.volts;
    this.data[at + 2] = row.amps;
    this.data[at + 3] = row.tempCelsius ?? Number.NaN;
    this.count++;
  }

  /** Row `i`'s time, s. */
  t(i: number): number {
    return this.data[i * COLUMNS]!;
  }

  /** Row `i`'s volts. */
  volts(i: number): number {
    return this.data[i * COLUMNS + 1]!;
  }

  /** Row `i`'s amps, before the sign is settled. */
  amps(i: number): number {
    return this.data[i * COLUMNS + 2]!;
  }

  /** Row `i`'s temperature, °C, or null when not measured. */
  tempCelsius(i: number): number | null {
    const c = this.data[i * COLUMNS + 3]!;
    return Number.isNaN(c) ? null : c;
  }
}
