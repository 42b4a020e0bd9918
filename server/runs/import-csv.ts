import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { parse } from 'csv-parse';
import { HttpError } from '../http/http-error.js';

/**
 * Longest line a log may have. Real loggers write lines of a few hundred bytes; without a
 * bound, a file with no line breaks (a binary, a wrong upload) would be held whole in memory.
 */
export const MAX_CSV_LINE_BYTES = 64 * 1024;
/** Delimiters a log may use: comma, or semicolon/tab where the decimal mark is a comma. */
const DELIMITERS = [',', ';', '\t'] as const;
export type Delimiter = (typeof DELIMITERS)[number];

/** Picks the delimiter of a log from its first line: the candidate that splits it most. */
export async function sniffDelimiter(filePath: string): Promise<Delimiter> {
  const handle = await open(filePath, 'r');
  try {
    const buf = Buffer.alloc(MAX_CSV_LINE_BYTES);
    const { bytesRead } = await handle.read(buf, 0, buf.length, 0);
    const text = buf.subarray(0, bytesRead).toString('utf8');
    const first = text.split(/\r?\n/).find((l) => l.trim() !== '' && !l.startsWith('#')) ?? '';
    const count = (d: string) => first.split(d).length - 1;
    return DELIMITERS.reduce<Delimiter>((best, d) => (count(d) > count(best) ? d : best), ',');
  } finally {
    await handle.close();
  }
}

/** csv-parse records with their line numbers, so errors can name the line. */
export async function* csvRecords(filePath: string, delimiter: Delimiter): AsyncGenerator<{ fields: string[]; line: number }> {
  const source = createReadStream(filePath);
  const parser = source.pipe(
    parse({ info: true, bom: true, delimiter, relax_column_count: false, skip_empty_lines: true, trim: true, comment: '#', max_record_size: MAX_CSV_LINE_BYTES }),
  );
  try {
    for await (const rec of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) yield { fields: rec.record, line: rec.info.lines };
  } catch (err) {
    const e = err as { message?: string; lines?: number; code?: string };
    if (e.code === 'CSV_MAX_RECORD_SIZE') throw new HttpError(400, `line ${e.lines ?? '?'}: longer than ${MAX_CSV_LINE_BYTES} bytes; is this a CSV log?`);
    if (e.code?.startsWith('CSV_')) throw new HttpError(400, `line ${e.lines ?? '?'}: ${e.message ?? 'malformed CSV'}`);
    throw err;
  } finally {
    source.destroy();
  }
}
