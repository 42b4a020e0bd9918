import { describe, expect, it } from 'vitest';
import { BatterySchema, type Battery } from '../../shared/schemas/battery.js';
import { LabSettingsSchema } from '../../shared/schemas/lab-settings.js';
import type { ProtectionResult } from '../../shared/schemas/protection-check.js';
import type { Run } from '../../shared/schemas/run.js';
import { capacityRows, packSpecRows, protectionResultLine } from './pack-report-rows.js';

const battery: Battery = BatterySchema.parse({
  id: 4, label: 'NG-0142', brand: 'Corvane', model: 'CV-100', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, ratedWh: 1280, bmsRatedAmps: null, massKg: 11.5,
  price: 420, priceCurrency: 'EUR', serialNumber: 'SN-1', sender: 'Someone', notes: 'internal', receivedOn: '2026-11-30', owner: 'A client', lengthMm: null, widthMm: null, heightMm: null,
  terminalType: null, statedCycleLife: 6000, warrantyMonths: 120, protectionSpecs: [], createdAt: '2026-11-30T00:00:00.000Z', updatedAt: '2026-11-30T00:00:00.000Z',
});
const settings = LabSettingsSchema.parse({ timeZone: 'Europe/Berlin', energyUnit: 'kWh', temperatureUnit: 'F' });

/** A finished capacity run as the repo gives it, with only the fields the rows read set. */
const run = (id: number, startedAt: string, ah: number, wh: number, verdict: string): Run =>
  ({ id, name: `Test ${id}`, kind: 'capacity-discharge', state: 'finished', startedAt, createdAt: startedAt, summary: { capacityEndedBy: 'end-voltage', capacityAh: ah, capacityWh: wh, verdict } }) as unknown as Run;

describe('pack report rows', () => {
  it('print the specs in the lab\'s units without the internal fields, and the price only when asked', () => {
    const rows = new Map(packSpecRows(battery, settings, false));
    expect(rows.get('Rated energy')).toBe('1.280 kWh') // 1280 Wh; the project prints kWh to 3 decimals (shared/units/format.ts);
    expect(rows.get('Warranty')).toBe('10 years');
    expect(rows.has('Price')).toBe(false);
    expect([...rows.values()].join(' ')).not.toMatch(/internal|Someone|A client/);
    expect(new Map(packSpecRows(battery, settings, true)).get('Price')).toBe('420.00 EUR');
  });

  it('list capacity runs oldest first with the date in the lab\'s zone (CET is UTC+1 in winter: IANA tz database) and % of rated', () => {
    const rows = capacityRows(battery, [run(2, '2026-02-01T23:30:00.000Z', 96, 1228.8, 'fail'), run(1, '2026-01-01T08:00:00.000Z', 101, 1292.8, 'pass')], settings);
    expect(rows).toEqual([
      ['2026-01-01 09:00 (Europe/Berlin)', 'Test 1', '101.00 Ah', '1.293 kWh', '101.0 %', '101.0 %', 'pass'],
      ['2026-02-02 00:30 (Europe/Berlin)', 'Test 2', '96.00 Ah', '1.229 kWh', '96.0 %', '96.0 %', 'fail'],
    ]);
  });

  it('put a protection result in words, temperatures in °F (60 °C = 140 °F, 61.2 °C = 142.16 °F: °F = °C × 9/5 + 32, NIST SP 811 B.8)', () => {
    const result = { protection: 'over-temp-discharge', expectedValue: 60, expectedDelaySeconds: 5, measuredValue: 61.2, measuredDelaySeconds: 6, outcome: 'pass' } as ProtectionResult;
    expect(protectionResultLine(result, settings)).toBe('Over-temperature, discharging: pass (expected 140.0 °F after 5 s, measured 142.2 °F after 6 s)');
  });
});
