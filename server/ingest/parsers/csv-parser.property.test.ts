import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CsvFormatSchema, type CsvFormat } from '../../../shared/schemas/bench.js';
import { createCsvParser, createCsvSpanParser } from './csv-parser.js';
import { readDecimal } from './strict-number.js';
import { legacyCreateCsvParser } from './testing/legacy-csv-parser.js';

const ARRIVAL_MS = Date.UTC(2026, 0, 1);
const fmt = (input: Record<string, unknown>): CsvFormat => CsvFormatSchema.parse({ kind: 'csv', ...input });

/** Formats that exercise every column kind, unit, delimiter and header mode. */
const FORMATS: CsvFormat[] = [
  fmt({ columns: ['t', 'volts', 'amps', 'temp:cell', 'aux:heaterAmps'], ampsUnit: 'mA' }),
  fmt({ columns: ['seq', 'volts', '-', 'amps'], delimiter: ';', header: 'skip-first', voltsUnit: 'mV', currentSign: 'discharge-negative' }),
  fmt({ columns: ['t', 'volts', 'amps', 'temp:a'], delimiter: ' ', timeUnit: 'ms', tempUnit: 'F' }),
  fmt({ columns: ['t', 'volts', 'amps'], delimiter: '\t', timeUnit: 'iso', header: 'none', tempUnit: 'K' }),
  fmt({ columns: ['volts', 'amps', 'temp:__proto__', 'aux:x'] }),
];

/** Characters of data, junk and edge cases: digits, signs, points, exponents, blanks of several kinds, quotes, words. */
const CHARS = '0123456789.,;-+eE \t\u00a0\u2003\r:"\'{}_xTtvAZ'.split('');
const noisyLine = fc.string({ unit: fc.constantFrom(...CHARS), maxLength: 60 });
const numberText = fc.oneof(
  fc.double({ noNaN: true }).map(String),
  fc.integer().map(String),
  fc.constantFrom('1e999', '-0', '.5', '5.', '+.5', '1e', '1e+', '00012.5000', '1.2.3', '', ' 7 ', '0x10', 'Infinity', '123456789012345678', '9007199254740993', '1.0000000000000002'),
);
/** Lines of mostly good numbers joined by a format's delimiter, sometimes with a field too many or too few. */
const dataLine = (delimiter: string) =>
  fc.array(numberText, { minLength: 1, maxLength: 6 }).map((fields) => fields.join(delimiter === ' ' ? ' ' : delimiter));

describe('the fast CSV parser gives exactly what the former parser gave', () => {
  it('the same frame, the same rejection with the same reason, the same skipped header', () => {
    for (const format of FORMATS) {
      fc.assert(
        fc.property(fc.array(fc.oneof(noisyLine, dataLine(format.delimiter)), { minLength: 1, maxLength: 5 }), (lines) => {
          const fast = createCsvParser(format);
          const legacy = legacyCreateCsvParser(format);
          for (const line of lines) expect(fast(line, ARRIVAL_MS)).toEqual(legacy(line, ARRIVAL_MS));
        }),
        { numRuns: 3000 },
      );
    }
  });
});

describe('a line parsed where it lies in a chunk of text', () => {
  it('gives what the same line parsed as a string of its own gives', () => {
    for (const format of FORMATS) {
      fc.assert(
        fc.property(noisyLine, fc.oneof(noisyLine, dataLine(format.delimiter)), noisyLine, (before, line, after) => {
          const text = `${before}\n${line}\n${after}`;
          const inPlace = createCsvSpanParser(format)(text, before.length + 1, before.length + 1 + line.length, ARRIVAL_MS);
          expect(inPlace).toEqual(createCsvParser(format)(line, ARRIVAL_MS));
        }),
        { numRuns: 2000 },
      );
    }
  });
});

describe('readDecimal', () => {
  const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
  const reference = (text: string): number => {
    if (!DECIMAL.test(text)) return Number.NaN;
    const value = Number(text);
    return Number.isFinite(value) ? value : Number.NaN;
  };

  it('equals Number() on every strictly decimal text and NaN elsewhere', () => {
    fc.assert(
      fc.property(fc.oneof(numberText, noisyLine, fc.double().map((x) => x.toFixed(6)), fc.double().map((x) => x.toExponential())), (text) => {
        expect(Object.is(readDecimal(text, 0, text.length), reference(text))).toBe(true);
      }),
      { numRuns: 20_000 },
    );
  });

  it('reads a decimal comma when asked, as replacing the first comma by a point would', () => {
    const cases = fc.oneof(numberText.map((t) => t.replace('.', ',')), noisyLine);
    fc.assert(
      fc.property(cases, (text) => {
        expect(Object.is(readDecimal(text, 0, text.length, true), reference(text.replace(',', '.')))).toBe(true);
      }),
      { numRuns: 10_000 },
    );
  });

  it('reads within the given bounds only', () => {
    // 0.1 + 0.2 style values: the exact double of the text, as Number() gives (ECMA-262, StringToNumber).
    expect(readDecimal('x,13.2104,y', 2, 9)).toBe(13.2104);
    expect(readDecimal('12.5', 0, 2)).toBe(12);
  });
});
