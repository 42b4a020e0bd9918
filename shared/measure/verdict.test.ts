import { describe, expect, it } from 'vitest';
import { peukertCapacityAh, peukertRuntimeHours } from './peukert.js';
import { nominalVolts, nominalWh, packVolts } from './nominal.js';
import { cRate, costPerKWh, percentOfRated, verdictFor, whPerKg, DEFAULT_ACCEPTANCE_PERCENT } from './figures.js';
import { ahFromWh, voltsFrom } from '../units/convert.js';

describe('trade arithmetic (common practice)', () => {
  it('8-cell LFP rated 50 Ah: 25.6 V nominal, 1,280 Wh', () => {
    expect(nominalVolts('lfp', 8)).toBeCloseTo(25.6, 12);
    expect(nominalWh('lfp', 8, 50)).toBeCloseTo(1280, 9);
  });
  it('LFP 4, 8, 16 cells: 12.8, 25.6, 51.2 V (3.2 V a cell)', () => {
    expect([4, 8, 16].map((n) => nominalVolts('lfp', n))).toEqual([12.8, 25.6, 51.2]);
  });
  it('charging 8 LFP cells to 3.6 V a cell is 28.8 V', () => {
    expect(packVolts(3.6, 8)).toBeCloseTo(28.8, 12);
  });
  it('1,299 Wh delivered at about 25.6 V is about 50.7 Ah; 337 W at 12.49 A is 26.98 V', () => {
    expect(ahFromWh(1299, 25.6)).toBeCloseTo(50.7, 1);
    expect(voltsFrom(337, 12.49)).toBeCloseTo(26.98, 2);
  });
  it('nominal volts for NMC (3.6 V, or 3.7 V when stated) and lead-acid (2.0 V a cell)', () => {
    expect(nominalVolts('nmc', 4)).toBeCloseTo(14.4, 12);
    expect(nominalVolts('nmc', 4, 3.7)).toBeCloseTo(14.8, 12);
    expect(nominalVolts('lead-acid', 6)).toBeCloseTo(12, 12);
    expect(nominalVolts('other', 6)).toBeNull();
    expect(nominalWh('lfp', null, 50)).toBeNull();
  });
});

describe('Peukert (published form t = H·(C/(I·H))^k), 100 Ah at the 20-hour rate, k = 1.2', () => {
  // Worked example as stated in issue 3 (Peukert's law in the capacity-at-rated-time form).
  it.each([
    [5, 20],
    [10, 8.706],
    [20, 3.789],
  ])('%d A lasts %d h', (amps, hours) => {
    expect(peukertRuntimeHours(100, 20, amps, 1.2)).toBeCloseTo(hours, 3);
  });
  it('k = 1 is an ideal battery: capacity independent of current', () => {
    expect(peukertCapacityAh(100, 20, 50, 1)).toBeCloseTo(100, 12);
    expect(() => peukertRuntimeHours(100, 20, 0, 1.2)).toThrow(RangeError);
  });
});

describe('verdict and derived figures', () => {
  it('% of rated and pass/fail against the acceptance % (default 100 %, IEC 61960-3 from memory)', () => {
    expect(DEFAULT_ACCEPTANCE_PERCENT).toBe(100);
    expect(percentOfRated(50.7, 50)).toBeCloseTo(101.4, 9);
    expect(verdictFor([percentOfRated(50.7, 50)])).toBe('pass');
    expect(verdictFor([percentOfRated(49.9, 50)])).toBe('fail');
    expect(verdictFor([percentOfRated(49.9, 50)], 95)).toBe('pass');
    expect(verdictFor([null])).toBe('unrated');
    expect(verdictFor([101, 99])).toBe('fail');
  });
  it('C-rate, cost per delivered kWh, Wh/kg (round trip: round-trip.test.ts)', () => {
    expect(cRate(10, 50)).toBeCloseTo(0.2, 12); // 0.2 C: 10 A from 50 Ah (definition of C-rate)
    expect(costPerKWh(320, 1280)).toBeCloseTo(250, 9); // price ÷ kWh
    expect(whPerKg(1280, 11.2)).toBeCloseTo(114.2857, 3);
    expect(costPerKWh(320, 0)).toBeNull();
    expect(whPerKg(1280, null)).toBeNull();
  });
});
