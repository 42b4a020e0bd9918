import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { ArchiveBatch } from './archive-batch.js';
import { encodeChunk, type EncodedChunk } from './chunk-encode.js';
import { computeStats } from './chunk-stats.js';
import { concatColumns, currentColumnName, decodeBlock, type BlockLayout, type Columns } from './column-block.js';
import { utcDateTime } from '../db/utc-datetime.js';

/** Small chunks are merged once this many readings sit in them (about 7 minutes at 10 Hz). */
export const COMPACT_READINGS = 4096;

interface ChunkRow {
  firstSeq: number;
  count: number;
  firstElapsedSeconds: number;
  lastElapsedSeconds: number;
  layout: string;
  data: Buffer;
}

/** Writes one batch (chunk, events, run row) in a single transaction; idempotent. */
export async function writeBatch(sequelize: Sequelize, batch: ArchiveBatch): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    const b = batch.block;
    if (b) {
      await sequelize.query(
        'INSERT IGNORE INTO run_reading_chunks (runId, firstSeq, count, firstElapsedSeconds, lastElapsedSeconds, layout, data, statsLayout, stats) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
        { replacements: [batch.runId, b.firstSeq, b.count, b.firstElapsedSeconds, b.lastElapsedSeconds, JSON.stringify(b.layout), b.data, JSON.stringify(b.statsLayout), b.stats], transaction },
      );
    }
    for (const { eventSeq, event } of batch.events) {
      await sequelize.query(
        'INSERT IGNORE INTO run_events (runId, eventSeq, type, elapsedSeconds, data, createdAt) VALUES (?, ?, ?, ?, ?, NOW(3))',
        { replacements: [batch.runId, eventSeq, event.type, event.elapsedSeconds, JSON.stringify(event)], transaction },
      );
    }
    await patchRun(sequelize, batch, transaction);
  });
}

/**
 * Writes several blocks of one run and its patch in a single transaction and one multi-row
 * INSERT (idempotent like writeBatch): a bulk writer such as the importer commits once for
 * many blocks instead of once per block.
 */
export async function writeBlocks(sequelize: Sequelize, runId: number, blocks: readonly EncodedChunk[], patch: ArchiveBatch['patch']): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    if (blocks.length > 0) {
      const replacements: unknown[] = [];
      for (const b of blocks) replacements.push(runId, b.firstSeq, b.count, b.firstElapsedSeconds, b.lastElapsedSeconds, JSON.stringify(b.layout), b.data, JSON.stringify(b.statsLayout), b.stats);
      await sequelize.query(
        `INSERT IGNORE INTO run_reading_chunks (runId, firstSeq, count, firstElapsedSeconds, lastElapsedSeconds, layout, data, statsLayout, stats) VALUES ${blocks.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ')}`,
        { replacements, transaction },
      );
    }
    await patchRun(sequelize, { runId, block: null, events: [], patch }, transaction);
  });
}

async function patchRun(sequelize: Sequelize, batch: ArchiveBatch, transaction: Transaction): Promise<void> {
  const sets: string[] = [];
  const values: unknown[] = [];
  const p = batch.patch;
  const add = (column: string, value: unknown) => {
    sets.push(`${column} = ?`);
    values.push(value);
  };
  if (p.state !== undefined) add('state', p.state);
  if (p.summary !== undefined) add('summary', p.summary === null ? null : JSON.stringify(p.summary));
  if (p.pipelineState !== undefined) add('pipelineState', p.pipelineState);
  if (p.readingsCount !== undefined) add('readingsCount', p.readingsCount);
  if (p.startedAt !== undefined) add('startedAt', utcDateTime(p.startedAt));
  if (p.endedAt !== undefined) add('endedAt', utcDateTime(p.endedAt));
  if (!sets.length) return;
  sets.push('updatedAt = NOW(3)');
  await sequelize.query(`UPDATE runs SET ${sets.join(', ')} WHERE id = ?`, { replacements: [...values, batch.runId], transaction });
}

/**
 * Merges a run's small chunks into blocks of about COMPACT_READINGS, so a 24-hour run
 * is read back as a few hundred blocks rather than tens of thousands. `all` also merges
 * a short tail (used when the run ends). Returns the number of chunks merged away.
 */
export async function compactRun(sequelize: Sequelize, runId: number, all = false): Promise<number> {
  const small = await sequelize.query<ChunkRow>(
    'SELECT firstSeq, count, firstElapsedSeconds, lastElapsedSeconds, layout, data FROM run_reading_chunks WHERE runId = ? AND count < ? ORDER BY firstSeq',
    { replacements: [runId, COMPACT_READINGS], type: QueryTypes.SELECT },
  );
  let merged = 0;
  let group: ChunkRow[] = [];
  let groupCount = 0;
  const flushGroup = async () => {
    if (group.length > 1) {
      await mergeGroup(sequelize, runId, group);
      merged += group.length - 1;
    }
    group = [];
    groupCount = 0;
  };
  for (const row of small) {
    const last = group[group.length - 1];
    // Only neighbouring chunks merge: a compacted block between two small ones stays put.
    if (last && last.firstSeq + last.count !== row.firstSeq) await flushGroup();
    group.push(row);
    groupCount += row.count;
    if (groupCount >= COMPACT_READINGS) await flushGroup();
  }
  if (all) await flushGroup();
  return merged;
}

async function mergeGroup(sequelize: Sequelize, runId: number, group: ChunkRow[]): Promise<void> {
  const first = group[0]!;
  const last = group[group.length - 1]!;
  const c = encodeChunk(first.firstSeq, concatColumns(group.map((r) => decodeBlock(JSON.parse(r.layout) as BlockLayout, r.data))));
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('DELETE FROM run_reading_chunks WHERE runId = ? AND firstSeq >= ? AND firstSeq <= ?', {
      replacements: [runId, first.firstSeq, last.firstSeq],
      transaction,
    });
    await sequelize.query(
      'INSERT INTO run_reading_chunks (runId, firstSeq, count, firstElapsedSeconds, lastElapsedSeconds, layout, data, statsLayout, stats) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
      { replacements: [runId, c.firstSeq, c.count, c.firstElapsedSeconds, c.lastElapsedSeconds, JSON.stringify(c.layout), c.data, JSON.stringify(c.statsLayout), c.stats], transaction },
    );
  });
}

/** Reads the decoded columns of every chunk overlapping [from, to] (run seconds), in order. */
export async function readChunks(
  sequelize: Sequelize,
  runId: number,
  from: number,
  to: number,
  wanted?: readonly string[],
): Promise<Columns[]> {
  const rows = await sequelize.query<Pick<ChunkRow, 'layout' | 'data'>>(
    'SELECT layout, data FROM run_reading_chunks WHERE runId = ? AND lastElapsedSeconds >= ? AND firstElapsedSeconds <= ? ORDER BY firstSeq',
    { replacements: [runId, from, to], type: QueryTypes.SELECT },
  );
  return rows.map((r) => {
    const layout = JSON.parse(r.layout) as BlockLayout;
    // Temperature columns are wanted by prefix: list them from the layout.
    const names = wanted ? layout.columns.map((c) => currentColumnName(c.name)).filter((n) => wanted.includes(n) || (wanted.includes('temp:*') && n.startsWith('temp:'))) : undefined;
    return decodeBlock(layout, r.data, names);
  });
}

/** Decoded min/max groups (chunk-stats.ts) of the chunks overlapping [from, to]; a chunk without them is decoded from its readings. */
export async function readStats(sequelize: Sequelize, runId: number, from: number, to: number): Promise<Columns[]> {
  // Only the small stats column is read: selecting `data` at all would pull every reading off disk.
  const rows = await sequelize.query<{ firstSeq: number; statsLayout: string | null; stats: Buffer | null }>(
    'SELECT firstSeq, statsLayout, stats FROM run_reading_chunks WHERE runId = ? AND lastElapsedSeconds >= ? AND firstElapsedSeconds <= ? ORDER BY firstSeq',
    { replacements: [runId, from, to], type: QueryTypes.SELECT },
  );
  const out: Columns[] = [];
  for (const r of rows) {
    if (r.stats && r.statsLayout) {
      out.push(decodeBlock(JSON.parse(r.statsLayout) as BlockLayout, r.stats));
      continue;
    }
    const [raw] = await sequelize.query<{ layout: string; data: Buffer }>('SELECT layout, data FROM run_reading_chunks WHERE runId = ? AND firstSeq = ?', {
      replacements: [runId, r.firstSeq],
      type: QueryTypes.SELECT,
    });
    if (raw) out.push(computeStats(decodeBlock(JSON.parse(raw.layout) as BlockLayout, raw.data)));
  }
  return out;
}

/** Calls `each` with every chunk of a run in order, one at a time (bounded memory for export). */
export async function forEachChunk(sequelize: Sequelize, runId: number, each: (cols: Columns) => Promise<void> | void): Promise<void> {
  const keys = await sequelize.query<{ firstSeq: number }>('SELECT firstSeq FROM run_reading_chunks WHERE runId = ? ORDER BY firstSeq', {
    replacements: [runId],
    type: QueryTypes.SELECT,
  });
  for (const { firstSeq } of keys) {
    const rows = await sequelize.query<Pick<ChunkRow, 'layout' | 'data'>>(
      'SELECT layout, data FROM run_reading_chunks WHERE runId = ? AND firstSeq = ?',
      { replacements: [runId, firstSeq], type: QueryTypes.SELECT },
    );
    const row = rows[0];
    if (row) await each(decodeBlock(JSON.parse(row.layout) as BlockLayout, row.data));
  }
}

/** Every column name (current names) that any of a run's blocks holds, for an export's header. */
export async function runColumnNames(sequelize: Sequelize, runId: number): Promise<Set<string>> {
  const layouts = await sequelize.query<{ layout: string }>('SELECT layout FROM run_reading_chunks WHERE runId = ?', {
    replacements: [runId],
    type: QueryTypes.SELECT,
  });
  const names = new Set<string>();
  for (const { layout } of layouts) for (const c of (JSON.parse(layout) as BlockLayout).columns) names.add(currentColumnName(c.name));
  return names;
}

/** Time span and count of a run's stored readings. */
export async function chunkExtent(sequelize: Sequelize, runId: number): Promise<{ from: number; to: number; count: number } | null> {
  const [row] = await sequelize.query<{ f: number | null; l: number | null; n: number | null }>(
    'SELECT MIN(firstElapsedSeconds) AS f, MAX(lastElapsedSeconds) AS l, SUM(count) AS n FROM run_reading_chunks WHERE runId = ?',
    { replacements: [runId], type: QueryTypes.SELECT },
  );
  if (!row || row.f === null || row.l === null) return null;
  return { from: Number(row.f), to: Number(row.l), count: Number(row.n) };
}
