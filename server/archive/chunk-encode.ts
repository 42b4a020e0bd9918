import { columnLength, encodeBlock, type BlockLayout, type Columns } from './column-block.js';
import { computeStats } from './chunk-stats.js';

/** One chunk ready for the database: its readings block and its min/max groups. */
export interface EncodedChunk {
  firstSeq: number;
  count: number;
  /** Run time (s) of the first and last reading, under the names of run_sample_chunks' columns (storage). */
  firstElapsed: number;
  lastElapsed: number;
  layout: BlockLayout;
  data: Buffer;
  statsLayout: BlockLayout;
  stats: Buffer;
}

/** Encodes reading columns (which must have `elapsed`) starting at reading number `firstSeq`. */
export function encodeChunk(firstSeq: number, cols: Columns): EncodedChunk {
  const count = columnLength(cols);
  const e = cols.elapsed!;
  const block = encodeBlock(cols);
  // The min/max groups are about 1/60 of the readings: stored raw, they are read without inflating.
  const stats = encodeBlock(computeStats(cols), 'raw');
  return { firstSeq, count, firstElapsed: e[0]!, lastElapsed: e[count - 1]!, ...block, statsLayout: stats.layout, stats: stats.data };
}
