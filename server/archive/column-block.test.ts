import { describe, expect, it } from 'vitest';
import { concatColumns, decodeBlock, encodeBlock } from './column-block.js';
import { readingsToColumns, readingAt } from '../readings/reading-columns.js';
import type { Reading } from '../../shared/schemas/reading.js';

const reading = (i: number, temps?: Record<string, number>): Reading => ({
  t: 1000 + i,
  elapsedSeconds: i,
  volts: 13.2 - i * 0.001,
  amps: 5,
  watts: (13.2 - i * 0.001) * 5,
  dischargeWh: i * 0.018,
  dischargeAh: i * 0.0014,
  chargeWh: 0,
  chargeAh: 0,
  clock: 'device',
  ...(temps ? { temps } : {}),
});

describe('column blocks', () => {
  it('round-trips readings bit for bit, including a channel only some readings have', () => {
    const readings = [reading(0, { cell: 21.5 }), reading(1), reading(2, { cell: 22 })];
    const { layout, data } = encodeBlock(readingsToColumns(readings));
    const back = decodeBlock(layout, data);
    expect(readingAt(back, 0)).toEqual(readings[0]);
    expect(readingAt(back, 1)).toEqual(readings[1]);
    expect(back['temp:cell']![2]).toBe(22);
  });

  it('stores small blocks raw when asked, and reads them back the same', () => {
    const cols = readingsToColumns([reading(0), reading(1)]);
    const { layout, data } = encodeBlock(cols, 'raw');
    expect(layout.encoding).toBe('raw');
    expect(data.length).toBe(Object.keys(cols).length * 2 * 8);
    expect(Array.from(decodeBlock(layout, data).volts!)).toEqual(Array.from(cols.volts!));
  });

  it('inflates only the wanted columns', () => {
    const { layout, data } = encodeBlock(readingsToColumns([reading(0), reading(1)]));
    expect(Object.keys(decodeBlock(layout, data, ['elapsedSeconds', 'volts'])).sort()).toEqual(['elapsedSeconds', 'volts']);
  });

  it('reads a block stored before the rename (run time column `elapsed`) back identically, under the new name', () => {
    const readings = [reading(0, { cell: 21.5 }), reading(1), reading(2, { cell: 22 })];
    const { elapsedSeconds, ...rest } = readingsToColumns(readings);
    // The block exactly as the archive wrote it before migration 1780: same bytes, old column name.
    const old = encodeBlock({ t: rest.t!, elapsed: elapsedSeconds!, ...rest }); // vocab-rename: keep
    const current = encodeBlock(readingsToColumns(readings));
    expect(old.layout.columns.map((c) => c.name)).toContain('elapsed'); // vocab-rename: keep
    expect(old.data.equals(current.data)).toBe(true);
    const back = decodeBlock(old.layout, old.data);
    expect(back).toEqual(decodeBlock(current.layout, current.data));
    for (let i = 0; i < readings.length; i++) expect(readingAt(back, i)).toEqual(readings[i]);
    expect(Object.keys(decodeBlock(old.layout, old.data, ['elapsedSeconds']))).toEqual(['elapsedSeconds']);
  });

  it('decodes small blocks into columns that own only their own bytes (no 16 KiB zlib buffer pinned per column)', () => {
    const readings = Array.from({ length: 10 }, (_, i) => reading(i, { cell: 20 + i }));
    for (const encoding of ['gzip', 'raw'] as const) {
      const { layout, data } = encodeBlock(readingsToColumns(readings), encoding);
      const back = decodeBlock(layout, data);
      for (const col of Object.values(back)) expect(col.buffer.byteLength).toBe(10 * Float64Array.BYTES_PER_ELEMENT);
      expect(readingAt(back, 9)).toEqual(readings[9]);
    }
  });

  it('names the column when a block is corrupt', () => {
    const { layout, data } = encodeBlock(readingsToColumns([reading(0), reading(1)]));
    const broken = Buffer.from(data);
    broken.fill(0, layout.columns[2]!.offset, layout.columns[2]!.offset + 12);
    expect(() => decodeBlock(layout, broken)).toThrow(/column volts is corrupt/);
  });

  it('refuses columns of unequal length', () => {
    expect(() => encodeBlock({ a: new Float64Array(2), b: new Float64Array(3) })).toThrow(/column b/);
  });

  it('concatenates parts, filling channels a part lacks with NaN', () => {
    const a = readingsToColumns([reading(0, { cell: 20 })]);
    const b = readingsToColumns([reading(1)]);
    const c = concatColumns([a, b]);
    expect(Array.from(c.elapsedSeconds!)).toEqual([0, 1]);
    expect(Number.isNaN(c['temp:cell']![1]!)).toBe(true);
  });
});
