import type { CsvFormat, JsonlFormat } from '../../../shared/schemas/bench.js';
import { createCsvParser } from './csv-parser.js';
import { createJsonlParser } from './jsonl-parser.js';
import type { LineParser } from './parse-result.js';

/** Picks the line parser for a text format. */
export function createLineParser(format: CsvFormat | JsonlFormat): LineParser {
  return format.kind === 'csv' ? createCsvParser(format) : createJsonlParser(format);
}
