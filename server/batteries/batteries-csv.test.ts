import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { Battery } from '../../shared/schemas/battery.js';
import { batteriesCsv, csvField } from './batteries-csv.js';

const now = '2026-12-01T20:00:00Z';
// A fictional pack of the demo lab (invented figures).
const pack: Battery = {
  id: 7, label: 'NG-0150', brand: 'Fenwick, "Cells"', model: null, chemistry: 'lfp', cellsInSeries: 8, cellsInParallel: 1,
  ratedAh: 100, ratedWh: 2560, bmsRatedAmps: 100, massKg: 21.5, price: 640, priceCurrency: 'EUR', serialNumber: 'FW-8-0150',
  sender: '=HYPERLINK("x")', notes: 'two lines\nof notes', receivedOn: '2026-11-20', owner: 'Harbour Solar', lengthMm: 330,
  widthMm: 172, heightMm: 215, terminalType: 'M8 studs', statedCycleLife: 6000, warrantyMonths: 60, protectionSpecs: [], createdAt: now, updatedAt: now,
};

describe('batteriesCsv', () => {
  it('round-trips through an independent RFC 4180 parser (csv-parse) with units in the header', () => {
    const rows = parse(batteriesCsv([pack]), { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      'brand': 'Fenwick, "Cells"', 'model': '', 'rated capacity [Ah]': '100', 'rated energy [Wh]': '2560',
      'length [mm]': '330', 'warranty [months]': '60', 'notes': 'two lines\nof notes', 'received on [YYYY-MM-DD]': '2026-11-20',
    });
  });

  it('defuses text a spreadsheet would run as a formula (OWASP CSV injection guidance)', () => {
    expect(csvField('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    expect(csvField('-5')).toBe("'-5");
    expect(csvField(-5)).toBe('-5');
    expect(csvField(null)).toBe('');
  });
});
