import { parse } from 'csv-parse/sync';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CsvRecordReader, type Delimiter } from './import-csv.js';

/** Field text: letters, digits, signs, blanks, the delimiters, quotes and line breaks (no `#`: both readers take it as a comment). */
const fieldText = fc.string({ unit: fc.constantFrom(...'ab01.-+ ,;\t"\n'.split('')), maxLength: 8 });

/** Writes a field as RFC 4180 asks: quoted (quotes doubled) when it holds a delimiter, a quote, a line break or edge blanks. */
function writeField(text: string, delimiter: Delimiter, quoteAnyway: boolean): string {
  const special = text.includes(delimiter) || text.includes('"') || text.includes('\n') || text !== text.trim() || text.includes('\t');
  return special || quoteAnyway ? `"${text.replaceAll('"', '""')}"` : text;
}

/** Every record's fields as the reader gives them. */
function readAll(text: string, delimiter: Delimiter, chunkBytes: number): string[][] {
  const out: string[][] = [];
  const reader = new CsvRecordReader(delimiter, (t, spans) => out.push(spans.texts(t)));
  for (let at = 0; at < text.length; at += chunkBytes) reader.push(text.slice(at, at + chunkBytes));
  reader.end();
  return out;
}

describe('the import reader agrees with csv-parse (an independent RFC 4180 reader from npm)', () => {
  it('on quoted and unquoted fields, doubled quotes, line breaks inside quotes, CRLF, however the text is cut', () => {
    const delimiter = fc.constantFrom<Delimiter>(',', ';', '\t');
    const table = fc.integer({ min: 2, max: 4 }).chain((columns) =>
      fc.array(fc.array(fc.tuple(fieldText, fc.boolean()), { minLength: columns, maxLength: columns }), { minLength: 1, maxLength: 6 }),
    );
    fc.assert(
      fc.property(delimiter, table, fc.boolean(), fc.integer({ min: 1, max: 64 }), (d, rows, crlf, chunkBytes) => {
        const text = rows.map((row) => row.map(([f, q]) => writeField(f, d, q)).join(d)).join(crlf ? '\r\n' : '\n') + '\n';
        const expected = parse(text, { delimiter: d, bom: true, skip_empty_lines: true, trim: true, relax_column_count: false }) as string[][];
        expect(readAll(text, d, chunkBytes)).toEqual(expected);
      }),
      { numRuns: 3000 },
    );
  });
});
