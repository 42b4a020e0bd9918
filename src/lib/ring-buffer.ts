/**
 * A preallocated columnar ring buffer for live readings, kept outside React.
 * One Float64Array per column; a gap is stored as NaN and read back as null, which uPlot
 * draws as a break in the line (never a straight line across an outage).
 */
export class ColumnarRingBuffer {
  readonly capacity: number;
  readonly columnCount: number;
  private readonly columns: Float64Array[];
  private head = 0; // index of the next write
  private count = 0;

  constructor(columnCount: number, capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1) throw new RangeError('capacity must be a positive integer');
    if (!Number.isInteger(columnCount) || columnCount < 1) throw new RangeError('columnCount must be a positive integer');
    this.capacity = capacity;
    this.columnCount = columnCount;
    this.columns = Array.from({ length: columnCount }, () => new Float64Array(capacity));
  }

  /** Rows currently held (at most `capacity`). */
  get length(): number {
    return this.count;
  }

  /** Appends one row in column order; the oldest row is overwritten once full. null = gap. */
  push(row: ArrayLike<number | null>): void {
    for (let c = 0; c < this.columnCount; c++) {
      const v = row[c];
      this.columns[c][this.head] = v === null || v === undefined ? Number.NaN : v;
    }
    this.head = (this.head + 1) % this.capacity;
    if (this.count < this.capacity) this.count++;
  }

  /** Empties the buffer without freeing its memory. */
  clear(): void {
    this.head = 0;
    this.count = 0;
  }

  /** Value of column `c` in row `i` counted from the oldest (0) row; null for a gap. */
  at(c: number, i: number): number | null {
    if (i < 0 || i >= this.count) return null;
    const v = this.columns[c][(this.head - this.count + i + this.capacity) % this.capacity];
    return Number.isNaN(v) ? null : v;
  }

  /** Newest value of column `c`, or null when empty or a gap. */
  last(c: number): number | null {
    return this.at(c, this.count - 1);
  }

  /**
   * Copies the rows oldest-first into `out` (one reusable array per column) and returns the
   * row count. The arrays are resized in place, so a steady stream allocates nothing new.
   */
  copyOrdered(out: (number | null)[][]): number {
    const start = (this.head - this.count + this.capacity) % this.capacity;
    for (let c = 0; c < this.columnCount; c++) {
      const src = this.columns[c];
      const dst = out[c];
      dst.length = this.count;
      for (let i = 0; i < this.count; i++) {
        const v = src[(start + i) % this.capacity];
        dst[i] = Number.isNaN(v) ? null : v;
      }
    }
    return this.count;
  }
}
