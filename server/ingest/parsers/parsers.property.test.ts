import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CsvFormatSchema, JsonlFormatSchema } from '../../../shared/schemas/bench.js';
import { FrameSchema } from '../../../shared/schemas/frame.js';
import { LineFramer } from '../framer/line-framer.js';
import { createLineParser } from './line-parser.js';
import { parseScpiNumber } from './scpi-reply.js';

const csv = CsvFormatSchema.parse({ kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell', 'aux:heaterAmps'], ampsUnit: 'mA' });
const jsonl = JsonlFormatSchema.parse({ kind: 'jsonl' });
const ARRIVAL_MS = Date.UTC(2026, 0, 1);

/** Lines that look like data, with junk mixed in: digits, separators, signs, exponents, quotes, braces. */
const noisyLine = fc.string({ unit: fc.constantFrom(...'0123456789.,-+eE :"{}[]tvoltsamp\t\r'.split('')), maxLength: 80 });

describe('parsers never throw and only ever produce valid Frames', () => {
  it('CSV and JSON-lines parsers, on arbitrary and data-like input', () => {
    for (const format of [csv, jsonl]) {
      const parse = createLineParser(format);
      fc.assert(
        fc.property(fc.oneof(fc.string({ maxLength: 200 }), noisyLine), (line) => {
          const result = parse(line, ARRIVAL_MS);
          if (result.kind === 'frame') expect(FrameSchema.safeParse(result.frame).success).toBe(true);
          if (result.kind === 'rejected') expect(result.reason.length).toBeGreaterThan(0);
        }),
        { numRuns: 2000 },
      );
    }
  });

  it('a CSV line of any finite numbers reads back exactly those numbers (amps from mA)', () => {
    const parse = createLineParser(csv);
    const num = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e9, max: 1e9 });
    fc.assert(
      fc.property(fc.tuple(num, num, num, num, num), ([t, volts, milliamps, temp, heater]) => {
        const result = parse([t, volts, milliamps, temp, heater].map(String).join(','), ARRIVAL_MS);
        expect(result.kind).toBe('frame');
        if (result.kind !== 'frame') return;
        // String(-0) is "0": compare with negative zero folded to zero.
        const z = (x: number) => x + 0;
        expect(result.frame).toEqual({
          t: z(t), volts: z(volts), amps: z(milliamps / 1000), temps: { cell: z(temp) }, aux: { heaterAmps: z(heater) }, clock: 'device',
        });
      }),
      { numRuns: 2000 },
    );
  });

  it('SCPI replies parse to finite numbers or a reason', () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ maxLength: 40 }), noisyLine), (reply) => {
        const parsed = parseScpiNumber(reply);
        if (parsed.ok) expect(Number.isFinite(parsed.value)).toBe(true);
        else expect(parsed.reason.length).toBeGreaterThan(0);
      }),
      { numRuns: 2000 },
    );
  });

  it('the framer yields the same lines however the byte stream is cut', () => {
    fc.assert(
      fc.property(fc.array(fc.stringMatching(/^[0-9.,]{1,20}$/), { minLength: 1, maxLength: 30 }), fc.array(fc.nat(40), { maxLength: 10 }), (lines, cuts) => {
        const stream = lines.map((l) => `${l}\r\n`).join('');
        const points = [...new Set(cuts.map((c) => c % (stream.length + 1)))].sort((a, b) => a - b);
        const framer = new LineFramer();
        const out: string[] = [];
        let at = 0;
        for (const point of [...points, stream.length]) {
          out.push(...framer.push(stream.slice(at, point)));
          at = point;
        }
        expect(out).toEqual(lines);
      }),
      { numRuns: 500 },
    );
  });
});
