import { constants as zlibConstants, gzipSync, gunzipSync } from 'node:zlib';
import type { Columns } from '../readings/reading-columns.js';

/**
 * A chunk of readings stored as one gzip'd Float64 array per channel, concatenated.
 * Each column is compressed on its own so a reader can inflate only what it needs
 * (the chart needs t/volts/amps, not the running totals). Byte order is the host's
 * (little-endian on every platform Node ships for); the layout records it.
 */
export interface ColumnLayoutEntry {
  name: string;
  offset: number;
  bytes: number;
}
export interface BlockLayout {
  endian: 'le';
  /** Absent = gzip (the default); `raw` for small blocks where inflating costs more than it saves. */
  encoding?: 'gzip' | 'raw';
  count: number;
  columns: ColumnLayoutEntry[];
}
export type { Columns };

/** gzip level 1: a few percent larger than the default level and several times faster to write. */
const GZIP_LEVEL = 1;
const BYTES_PER_VALUE = Float64Array.BYTES_PER_ELEMENT;

/**
 * A column as a Float64Array that owns exactly its own bytes. zlib's default output buffer is
 * 16 KiB and the result is a view into it, so a 10-reading live chunk decoded as is would pin
 * 16 KiB per column: compacting 20 runs at once held about 60 MB that way and the allocator
 * kept the pages (docs/archive.md). Inflating into a buffer of the known size avoids that;
 * anything else (a raw slice of the row, an unaligned view) is copied once.
 */
function columnOf(packed: Buffer, count: number, encoding: BlockLayout['encoding']): Float64Array {
  const bytes = count * BYTES_PER_VALUE;
  const raw = encoding === 'raw' ? packed : gunzipSync(packed, { chunkSize: Math.max(zlibConstants.Z_MIN_CHUNK, bytes) });
  if (raw.byteLength !== bytes) throw new Error('corrupt');
  if (raw.byteOffset === 0 && raw.buffer.byteLength === bytes) return new Float64Array(raw.buffer, 0, count);
  const own = new Float64Array(count);
  new Uint8Array(own.buffer).set(raw);
  return own;
}

/** Packs equal-length Float64 columns into one buffer plus its layout. */
export function encodeBlock(columns: Columns, encoding: 'gzip' | 'raw' = 'gzip'): { layout: BlockLayout; data: Buffer } {
  const names = Object.keys(columns);
  const count = names.length ? columns[names[0]!]!.length : 0;
  const parts: Buffer[] = [];
  const entries: ColumnLayoutEntry[] = [];
  let offset = 0;
  for (const name of names) {
    const col = columns[name]!;
    if (col.length !== count) throw new Error(`column ${name} has ${col.length} values, expected ${count}`);
    const bytes = Buffer.from(col.buffer, col.byteOffset, col.byteLength);
    const packed = encoding === 'raw' ? Buffer.from(bytes) : gzipSync(bytes, { level: GZIP_LEVEL });
    parts.push(packed);
    entries.push({ name, offset, bytes: packed.length });
    offset += packed.length;
  }
  return { layout: { endian: 'le', ...(encoding === 'raw' ? { encoding } : {}), count, columns: entries }, data: Buffer.concat(parts) };
}

/**
 * Names a block stored before a rename gave its columns, and their names now. Blocks are
 * never rewritten for a rename (a compaction rewrites them under the new names anyway), so
 * this is the one place an old name is read; everything past decodeBlock sees only new names.
 */
const STORED_COLUMN_RENAMES: Readonly<Record<string, string>> = {
  elapsed: 'elapsedSeconds', // before migration 1780: the run time column. vocab-rename: keep
};

/** The current name of a column as a block stores it (an old block may use a name from before a rename). */
export function currentColumnName(stored: string): string {
  return STORED_COLUMN_RENAMES[stored] ?? stored;
}

/** Inflates the named columns of a block (all when `wanted` is omitted, current names); missing names are skipped. */
export function decodeBlock(layout: BlockLayout, data: Buffer, wanted?: readonly string[]): Columns {
  const out: Columns = {};
  for (const entry of layout.columns) {
    const name = currentColumnName(entry.name);
    if (wanted && !wanted.includes(name)) continue;
    const slice = data.subarray(entry.offset, entry.offset + entry.bytes);
    let view: Float64Array;
    try {
      view = columnOf(slice, layout.count, layout.encoding);
    } catch {
      throw new Error(`column ${entry.name} is corrupt`);
    }
    out[name] = view;
  }
  return out;
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
