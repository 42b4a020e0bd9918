/**
 * The archive's read side as other areas see it (run history for charts, exports): whole
 * columns of a run, its extent, and the min/max reductions, never the block encoding.
 */
export { chunkExtent, forEachChunk, readChunks, readStats, runColumnNames } from './chunk-store.js';
export { STATS_GROUP_READINGS } from './chunk-stats.js';
export { reduceReadings, reduceStats } from './reading-reducer.js';
export { reduceOverDischarge } from './axis-reducer.js';
export type { Columns } from '../readings/reading-columns.js';
