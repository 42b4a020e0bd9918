import { columnLength, encodeBlock, type BlockLayout, type Columns } from './column-block.js';
import { computeStats } from './chunk-stats.js';

/** One chunk ready for the database: its readings block and its min/max groups. */
export interface EncodedChunk {
  firstSeq: number;
  count: number;
  /** Run time (s) of the first and last reading, as stored in run_reading_chunks. */
  firstElapsedSeconds: number;
  lastElapsedSeconds: number;
  layout: BlockLayout;
  data: Buffer;
  statsLayout: BlockLayout;
  stats: Buffer;
}

/** Encodes reading columns (which must have `elapsedSeconds`) starting at reading number `firstSeq`. */
export function encodeChunk(firstSeq: number, cols: Columns): EncodedChunk {
  const count = columnLength(cols);
  const e = cols.elapsedSeconds!;
  const block = encodeBlock(cols);
  // The min/max groups are about 1/60 of the readings: stored raw, they are read without inflating.
  const stats = encodeBlock(computeStats(cols), 'raw');
  return { firstSeq, count, firstElapsedSeconds: e[0]!, lastElapsedSeconds: e[count - 1]!, ...block, statsLayout: stats.layout, stats: stats.data };
}
