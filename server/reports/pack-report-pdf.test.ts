import { describe, expect, it } from 'vitest';
import { BatterySchema } from '../../shared/schemas/battery.js';
import { LabSettingsSchema } from '../../shared/schemas/lab-settings.js';
import type { Run } from '../../shared/schemas/run.js';
import { pdfText } from '../../tests/integration/helpers/pdf-text.js';
import { renderPackReportPdf } from './pack-report-pdf.js';

const RUNS = 300;
/** Laying out and reading back 300 runs' tables takes about 5 s on a busy 2-core machine. */
const LONG_PDF_TIMEOUT_MS = 30_000;
const battery = BatterySchema.parse({
  id: 1, label: 'NG-0300', brand: 'Corvane', model: null, chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, ratedWh: null, bmsRatedAmps: null, massKg: null,
  price: null, priceCurrency: null, serialNumber: null, sender: null, notes: null, receivedOn: null, owner: null, lengthMm: null, widthMm: null, heightMm: null,
  terminalType: null, statedCycleLife: null, warrantyMonths: null, protectionSpecs: [], createdAt: '2026-01-01T00:00:00.000Z', updatedAt: '2026-01-01T00:00:00.000Z',
});
/** Finished capacity runs with only the fields the report reads, newest first as the repo lists them. */
const runs = Array.from({ length: RUNS }, (_, i) => {
  const startedAt = new Date(Date.UTC(2001, 0, 1 + 7 * i)).toISOString();
  return { id: i + 1, name: `Weekly test ${i + 1}`, kind: 'capacity-discharge', state: 'finished', startedAt, createdAt: startedAt, summary: { capacityEndedBy: 'end-voltage', capacityAh: 100 - i / 10, capacityWh: 1280 - i, verdict: 'pass' } } as unknown as Run;
}).reverse();

describe('the pack report PDF', () => {
  it('breaks long tables across pages without losing a row, numbering every page', { timeout: LONG_PDF_TIMEOUT_MS }, async () => {
    const pdf = await renderPackReportPdf({ battery, includePrices: false, runs, protectionRows: [], inspection: [], otherPhotos: [], settings: LabSettingsSchema.parse({}), madeAt: new Date('2026-12-02T08:00:00Z') });
    const text = await pdfText(pdf);
    const pages = text.split('\n');
    expect(pages.length).toBeGreaterThan(2);
    pages.forEach((page, i) => expect(page).toContain(`page ${i + 1} of ${pages.length}`));
    // Each run twice: once in the capacity history, once in the runs list.
    for (const n of [1, 150, RUNS]) expect(text.split(`Weekly test ${n} `).length - 1).toBe(2);
    expect(text).toContain('70.10 Ah'); // run 300: 100 − 299/10 Ah
    expect(text).toContain('Safety: lithium packs can burn');
  });
});
