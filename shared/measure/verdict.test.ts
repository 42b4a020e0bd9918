import { describe, expect, it } from 'vitest';
import { peukertCapacityAh, peukertRuntimeFromTest, peukertRuntimeHours } from './peukert.js';
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
  // The published form's arithmetic (10 A: 20·0.5^1.2 = 8.706 h); the worked example of a
  // blog on Peukert's law below checks the same form against an outside source.
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

describe('Peukert from a measured discharge', () => {
  it('a battery rated 120 Ah over 20 hours delivering 120 A lasts about 0.30 h with k = 1.4', () => {
    // Worked example: oracletutoring.ca, "Battery output vs discharge rate: Peukert's Law"
    // (t = T·(C/(I·T))^k, 120 Ah over 20 h at 120 A: t = 0.30 hours, about 18 minutes).
    expect(peukertRuntimeFromTest(120, 6, 120, 1.4)).toBeCloseTo(0.3, 2);
  });
  it('at the test current it returns the test duration, and k = 1 keeps the Ah', () => {
    expect(peukertRuntimeFromTest(48, 10, 10, 1.05)).toBeCloseTo(4.8, 12);
    expect(peukertRuntimeFromTest(48, 10, 40, 1) * 40).toBeCloseTo(48, 12);
    expect(() => peukertRuntimeFromTest(48, 0, 10, 1.05)).toThrow(RangeError);
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
