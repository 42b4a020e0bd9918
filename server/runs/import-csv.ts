import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { CsvError, parse } from 'csv-parse';
import { InvalidInputError } from '../domain/domain-errors.js';

/**
 * Longest line a log may have. Real loggers write lines of a few hundred bytes; without a
 * bound, a file with no line breaks (a binary, a wrong upload) would be held whole in memory.
 */
export const MAX_CSV_LINE_BYTES = 64 * 1024;
/** Lines the delimiter sniffer reads: the header and a few rows are enough to see the pattern. */
const SNIFF_LINES = 6;
/** Delimiters a log may use: comma, or semicolon/tab where the decimal mark is a comma. */
export type Delimiter = ',' | ';' | '\t';
/** Text logs never hold a NUL byte; spreadsheets, archives and images nearly always do. */
const NUL = 0;

/** Lines that carry data or the header (not blank, not a `#` comment), with their 1-based numbers. */
function meaningfulLines(text: string): { text: string; line: number }[] {
  return text
    .split(/\r?\n/)
    .map((l, i) => ({ text: l, line: i + 1 }))
    .filter((l) => l.text.trim() !== '' && !l.text.startsWith('#'));
}

/**
 * Picks the delimiter of a log from its first lines. Semicolon or tab wins when it splits the
 * header and every sampled row into the same number of fields: a semicolon file with decimal
 * commas, or with commas inside its headers ("Time, s;Voltage, V"), also has commas on each
 * line, while a comma file rarely has a semicolon on every line. Otherwise comma.
 * Refuses a binary file (a NUL byte) with an InvalidInputError naming its line.
 */
export function pickDelimiter(head: string): Delimiter {
  const lines = meaningfulLines(head).slice(0, SNIFF_LINES);
  // The last sampled line may be cut off by the read buffer: judge it only if it is the only one.
  const judged = lines.length > 2 ? lines.slice(0, -1) : lines;
  const count = (l: string, d: string) => l.split(d).length - 1;
  for (const d of ['\t', ';'] as const) {
    const n = count(judged[0]?.text ?? '', d);
    if (n > 0 && judged.every((l) => count(l.text, d) === n)) return d;
  }
  return ',';
}

/** Reads the head of a log: refuses binaries, then picks the delimiter (see pickDelimiter). */
export async function sniffDelimiter(filePath: string): Promise<Delimiter> {
  const handle = await open(filePath, 'r');
  try {
    const buf = Buffer.alloc(MAX_CSV_LINE_BYTES);
    const { bytesRead } = await handle.read(buf, 0, buf.length, 0);
    const head = buf.subarray(0, bytesRead);
    const nulAt = head.indexOf(NUL);
    if (nulAt >= 0) {
      const line = head.subarray(0, nulAt).toString('latin1').split('\n').length;
      throw new InvalidInputError(`line ${line}: binary data (a NUL byte); this is not a CSV text log`);
    }
    return pickDelimiter(head.toString('utf8'));
  } finally {
    await handle.close();
  }
}

/** Words for csv-parse's error codes, so the message says what to fix. */
const CSV_PROBLEMS: Record<string, string> = {
  INVALID_OPENING_QUOTE: 'a quote inside an unquoted field',
  CSV_INVALID_CLOSING_QUOTE: 'text after a closing quote',
  CSV_QUOTE_NOT_CLOSED: 'a quote that is never closed',
  CSV_RECORD_INCONSISTENT_FIELDS_LENGTH: 'a different number of fields than the header',
  CSV_RECORD_INCONSISTENT_COLUMNS: 'a different number of fields than the header',
  CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE: 'text after a closing quote',
};

/** Turns any csv-parse error into an InvalidInputError that names the line; other errors pass through. */
export function csvErrorToHttp(err: unknown): unknown {
  if (!(err instanceof CsvError)) return err;
  const line = (err as CsvError & { lines?: number }).lines ?? '?';
  if (err.code === 'CSV_MAX_RECORD_SIZE') return new InvalidInputError(`line ${line}: longer than ${MAX_CSV_LINE_BYTES} bytes; is this a CSV log?`);
  const problem = CSV_PROBLEMS[err.code] ?? 'not readable as CSV';
  return new InvalidInputError(`line ${line}: ${problem} (${err.message.slice(0, 160)})`);
}

/** Bytes read from disk at a time: large reads keep the parser busy rather than the event loop. */
const READ_CHUNK_BYTES = 1 << 20;

/**
 * csv-parse records with their line numbers, so errors can name the line. The number is read
 * from the parser's running count as each record is pushed: csv-parse's own `info` option
 * copies a dozen fields per record and doubles the time of a million-row pass.
 */
export async function* csvRecords(filePath: string, delimiter: Delimiter): AsyncGenerator<{ fields: string[]; line: number }> {
  const source = createReadStream(filePath, { highWaterMark: READ_CHUNK_BYTES });
  const parser = source.pipe(
    parse({ bom: true, delimiter, relax_column_count: false, skip_empty_lines: true, trim: true, comment: '#', max_record_size: MAX_CSV_LINE_BYTES }),
  );
  const push = parser.push.bind(parser);
  // csv-parse pushes each record synchronously once its last line is read, so the count is that record's last line.
  parser.push = (record: unknown, encoding?: BufferEncoding) => push(Array.isArray(record) ? { fields: record as string[], line: parser.info.lines } : record, encoding);
  try {
    for await (const rec of parser as AsyncIterable<{ fields: string[]; line: number }>) yield rec;
  } catch (err) {
    throw csvErrorToHttp(err);
  } finally {
    source.destroy();
  }
}
