import { gzipSync, gunzipSync } from 'node:zlib';

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
export type Columns = Record<string, Float64Array>;

/** gzip level 1: a few percent larger than the default level and several times faster to write. */
const GZIP_LEVEL = 1;

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

/** Inflates the named columns of a block (all when `wanted` is omitted); missing names are skipped. */
export function decodeBlock(layout: BlockLayout, data: Buffer, wanted?: readonly string[]): Columns {
  const out: Columns = {};
  for (const entry of layout.columns) {
    if (wanted && !wanted.includes(entry.name)) continue;
    const slice = data.subarray(entry.offset, entry.offset + entry.bytes);
    const raw = layout.encoding === 'raw' ? slice : gunzipSync(slice);
    // A Float64Array view needs 8-byte alignment; gunzip's buffer may come from a pool.
    const aligned = raw.byteOffset % 8 === 0 ? raw : Buffer.from(raw);
    const view = new Float64Array(aligned.buffer, aligned.byteOffset, aligned.byteLength / 8);
    if (view.length !== layout.count) throw new Error(`column ${entry.name} is corrupt`);
    out[entry.name] = view;
  }
  return out;
}
