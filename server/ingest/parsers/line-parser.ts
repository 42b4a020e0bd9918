import type { CsvFormat, JsonlFormat } from '../../../shared/schemas/bench.js';
import { createCsvParser, createCsvSpanParser } from './csv-parser.js';
import { createJsonlParser } from './jsonl-parser.js';
import type { LineParser, SpanParser } from './parse-result.js';

/** Picks the line parser for a text format. */
export function createLineParser(format: CsvFormat | JsonlFormat): LineParser {
  return format.kind === 'csv' ? createCsvParser(format) : createJsonlParser(format);
}

/** Picks the parser of lines given in place for a text format (JSON lines cut their string). */
export function createSpanParser(format: CsvFormat | JsonlFormat): SpanParser {
  if (format.kind === 'csv') return createCsvSpanParser(format);
  const parse = createJsonlParser(format);
  return (text, start, end, arrivalMs) => parse(text.slice(start, end), arrivalMs);
}
