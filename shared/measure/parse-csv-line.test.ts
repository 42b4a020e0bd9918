import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseCsvLine } from './parse-csv-line.js';

describe('parseCsvLine', () => {
  it('agrees with csv-parse (npm) on every row of the NASA B0005 fixture', () => {
    // Reference library: csv-parse; fixture: NASA PCoE B0005 cycle 1 (tests/fixtures/README.md).
    const text = readFileSync(fileURLToPath(new URL('../../tests/fixtures/nasa-pcoe-b0005-discharge-cycle1.csv', import.meta.url)), 'utf8');
    const rows = parse(text, { from_line: 2, cast: true }) as unknown as number[][];
    const lines = text.trim().split('\n').slice(1);
    expect(lines).toHaveLength(rows.length);
    lines.forEach((line, i) => {
      const r = parseCsvLine(line, { t: 0, volts: 1, amps: 2, temps: { cell: 3 }, ampsSign: -1 });
      if (!r.ok) throw new Error(r.error);
      expect(r.frame).toEqual({ t: rows[i]![0], volts: rows[i]![1], amps: -rows[i]![2]!, temps: { cell: rows[i]![3] }, clock: 'device' });
    });
  });

  it('refuses empty, missing and non-numeric cells with a message naming the column', () => {
    expect(parseCsvLine('1,,2')).toEqual({ ok: false, error: expect.stringContaining('column 2 (volts)') });
    expect(parseCsvLine('1,12.5')).toEqual({ ok: false, error: 'missing column 3 (amps)' });
    expect(parseCsvLine('1,12.5,abc')).toMatchObject({ ok: false });
    expect(parseCsvLine('1,12.5,Infinity')).toMatchObject({ ok: false });
    expect(parseCsvLine('1;12.5;3', { t: 0, volts: 1, amps: 2, delimiter: ';', aux: { heaterAmps: 2 } })).toEqual({
      ok: true, frame: { t: 1, volts: 12.5, amps: 3, aux: { heaterAmps: 3 }, clock: 'device' },
    });
  });
});

describe('parseCsvLine number reading', () => {
  it('reads every plain decimal exactly as Number() does (fast path is exact; property, fast-check)', async () => {
    const fc = (await import('fast-check')).default;
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }), fc.integer({ min: 0, max: 12 }), (x, decimals) => {
        const text = x.toFixed(decimals);
        const r = parseCsvLine(`${text},${text},${text}`);
        expect(r.ok && r.frame.volts).toBe(Number(text));
      }),
      { numRuns: 2000 },
    );
    for (const text of ['1e3', ' 12.5 ', '+3.25', '.5', '5.', '-0.000', '123456789012345678']) {
      const r = parseCsvLine(`0,${text},1`);
      expect(r.ok && r.frame.volts).toBe(Number(text));
    }
    expect(parseCsvLine('0,1.2.3,1').ok).toBe(false);
    expect(parseCsvLine('0,-,1').ok).toBe(false);
  });
});
