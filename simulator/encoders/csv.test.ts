import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import { createCsvEncoder } from './csv.js';
import { createJsonlEncoder } from './jsonl.js';
import { FrameSchema } from '../../shared/schemas/frame.js';

const frame: Frame = { t: 12.5, volts: 13.2456, amps: -4.5, temps: { cell: 21.37, ambient: 20 }, aux: { heaterAmps: 2.25 }, clock: 'device', seq: 12 };

describe('CSV encoder', () => {
  it('writes a header and one line per frame that csv-parse reads back', () => {
    const encoder = createCsvEncoder();
    const text = encoder.header()! + encoder.encode(frame) + encoder.encode({ ...frame, t: 13.5 });
    const rows = parse(text, { columns: true, cast: true }) as Record<string, number>[];
    expect(rows).toEqual([
      { t_s: 12.5, volts_V: 13.246, amps_A: -4.5, temp_cell_C: 21.4 },
      { t_s: 13.5, volts_V: 13.246, amps_A: -4.5, temp_cell_C: 21.4 },
    ]);
  });

  it('converts units and drops the time column when asked', () => {
    const encoder = createCsvEncoder({
      header: false,
      delimiter: ';',
      lineEnding: '\n',
      columns: [
        { field: 'volts', unit: 'mV', decimals: 0 },
        { field: 'amps', unit: 'mA', decimals: 0 },
        // °F = °C × 9/5 + 32 (ISO 80000-5 conversion).
        { field: 'temp:cell', unit: 'F', decimals: 2 },
        { field: 'aux:heaterAmps', decimals: 2 },
        { field: 'temp:missing', decimals: 1 },
      ],
    });
    expect(encoder.header()).toBeUndefined();
    expect(encoder.encode(frame)).toBe('13246;-4500;70.47;2.25;\n');
  });

  it('refuses an unknown field name', () => {
    expect(() => createCsvEncoder({ columns: [{ field: 'watts' }] })).toThrow(/field/);
  });
});

describe('JSON-lines encoder', () => {
  it('writes one Frame per line that the shared Frame schema accepts', () => {
    const line = createJsonlEncoder().encode(frame);
    expect(line.endsWith('\n')).toBe(true);
    expect(line.indexOf('\n')).toBe(line.length - 1);
    expect(FrameSchema.parse(JSON.parse(line))).toEqual(frame);
  });
});
