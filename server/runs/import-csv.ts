import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import { FieldSpans, splitRecord } from '../ingest/parsers/csv-fields.js';
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
const CODE_CR = 13;

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
 * Refuses a binary file (a NUL byte) with a 400 naming its line.
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

/** Bytes read from disk at a time: large reads keep the parser busy rather than the event loop. */
const READ_CHUNK_BYTES = 1 << 20;
const BOM = '\uFEFF';

/** Called for each record: its text, where its fields lie, and its last line's 1-based number. */
export type RecordHandler = (text: string, spans: FieldSpans, line: number) => void;

/**
 * Cuts a log's text into records and their fields with the same strict field scanner as the
 * live meters' parser (ingest/parsers/csv-fields.ts): RFC 4180 quotes (which may hold line
 * breaks), blanks trimmed, `#` comments and blank lines skipped, LF, CRLF or CR line ends.
 * Every record must have as many fields as the first (the header). Problems are 400s naming
 * the line; line numbers count every line of the file, comments and blank ones included.
 */
export class CsvRecordReader {
  private readonly spans = new FieldSpans();
  private pending = '';
  /** A record whose quote is still open, waiting for its next line. */
  private open = '';
  private openSince = 0;
  private line = 0;
  private newline: '\n' | '\r' | null = null;
  private fieldCount = -1;
  private started = false;

  constructor(
    private readonly delimiter: Delimiter,
    private readonly onRecord: RecordHandler,
  ) {}

  /** Feeds decoded text; calls onRecord for each record it completes. */
  push(chunk: string): void {
    let text = chunk;
    if (!this.started && text !== '') {
      this.started = true;
      if (text.startsWith(BOM)) text = text.slice(BOM.length);
    }
    if (this.pending !== '') text = this.pending + text;
    this.pending = '';
    this.newline ??= text.includes('\n') ? '\n' : text.includes('\r') ? '\r' : null;
    if (this.newline === null) return this.keep(text);
    const nl = this.newline;
    let start = 0;
    for (;;) {
      const at = text.indexOf(nl, start);
      if (at < 0) break;
      const end = nl === '\n' && at > start && text.charCodeAt(at - 1) === CODE_CR ? at - 1 : at;
      this.take(text.slice(start, end));
      start = at + 1;
    }
    this.keep(start === 0 ? text : text.slice(start));
  }

  /** The file ended: takes its last line (one without a line end) and refuses an open quote. */
  end(): void {
    if (this.pending !== '') {
      const last = this.pending;
      this.pending = '';
      this.take(last.endsWith('\r') ? last.slice(0, -1) : last);
    }
    if (this.open !== '') throw new InvalidInputError(`line ${this.openSince}: a quote that is never closed`);
  }

  private keep(rest: string): void {
    if (rest.length > MAX_CSV_LINE_BYTES) throw this.tooLong(this.line + 1);
    this.pending = rest;
  }

  private tooLong(line: number): InvalidInputError {
    return new InvalidInputError(`line ${line}: longer than ${MAX_CSV_LINE_BYTES} bytes; is this a CSV log?`);
  }

  private take(lineText: string): void {
    this.line++;
    const { spans } = this;
    let text = lineText;
    const continuing = this.open !== '';
    if (continuing) {
      text = `${this.open}\n${lineText}`;
      this.open = '';
      if (text.length > MAX_CSV_LINE_BYTES) throw this.tooLong(this.line);
    }
    const split = splitRecord(text, this.delimiter, spans);
    if (split === 'empty') return;
    if (split === 'open-quote') {
      if (!continuing) this.openSince = this.line;
      this.open = text;
      return;
    }
    if (split === 'quote-in-field') throw new InvalidInputError(`line ${this.line}: a quote inside an unquoted field`);
    if (split === 'text-after-quote') throw new InvalidInputError(`line ${this.line}: text after a closing quote`);
    if (this.fieldCount < 0) this.fieldCount = spans.count;
    else if (spans.count !== this.fieldCount) {
      throw new InvalidInputError(`line ${this.line}: a different number of fields than the header (${spans.count}, the header has ${this.fieldCount})`);
    }
    this.onRecord(text, spans, this.line);
  }
}

/**
 * Reads a log's records from disk in large chunks through CsvRecordReader. `afterChunk` is
 * awaited between chunks (the importer writes its archive blocks there), so a file of a
 * million rows is read without holding more than a chunk and without a promise per row.
 */
export async function readCsvRecords(filePath: string, delimiter: Delimiter, onRecord: RecordHandler, afterChunk?: () => Promise<void>): Promise<void> {
  const reader = new CsvRecordReader(delimiter, onRecord);
  const source = createReadStream(filePath, { highWaterMark: READ_CHUNK_BYTES, encoding: 'utf8' });
  try {
    for await (const chunk of source as AsyncIterable<string>) {
      reader.push(chunk);
      if (afterChunk) await afterChunk();
    }
    reader.end();
  } finally {
    source.destroy();
  }
}

/** Every record of a log as field texts with its line number (for tests and small files; the importer uses readCsvRecords). */
export async function* csvRecords(filePath: string, delimiter: Delimiter): AsyncGenerator<{ fields: string[]; line: number }> {
  const batch: { fields: string[]; line: number }[] = [];
  const reader = new CsvRecordReader(delimiter, (text, spans, line) => batch.push({ fields: spans.texts(text), line }));
  const source = createReadStream(filePath, { highWaterMark: READ_CHUNK_BYTES, encoding: 'utf8' });
  try {
    for await (const chunk of source as AsyncIterable<string>) {
      reader.push(chunk);
      yield* batch.splice(0);
    }
    reader.end();
    yield* batch.splice(0);
  } finally {
    source.destroy();
  }
}
