import { describe, expect, it } from 'vitest';
import { ampHourStandardUncertainty, capacityUncertainty, rectangularStandard, wattHourStandardUncertainty } from './uncertainty.js';
import { verdictWithUncertainty } from './figures.js';
import { MeterAccuracySchema } from '../schemas/meter-accuracy.js';

/**
 * Worked example, by hand, following JCGM 100:2008 (GUM) 4.3.7 (rectangular: u = a/√3) and
 * 5.1.2 (root sum of squares of sensitivity-weighted standard uncertainties), k = 2 (6.3.3).
 * Meter (a data sheet's form, values ours): volts ±(0.1 % + 0.01 V), amps ±(0.2 % + 0.02 A).
 * Discharge: a constant 10 A for 5 h at a constant 25.6 V:
 *   Ah = 10 × 5 = 50 Ah, Wh = 25.6 × 50 = 1280 Wh, t_load = 5 h, ∫V dt = 25.6 × 5 = 128 V·h.
 * Ah:  u_gain = 0.002 × 50 / √3 = 0.1 / 1.7320508 = 0.0577350 Ah
 *      u_off  = 0.02 × 5 / √3  = 0.1 / 1.7320508 = 0.0577350 Ah
 *      u(Ah)  = √(0.0577350² + 0.0577350²) = √(0.00666667) = 0.0816497 Ah;  U = 2u = 0.1632993 Ah
 * Wh:  u_gV = 0.001 × 1280 / √3 = 1.28 / √3  → u² = 1.6384 / 3 = 0.5461333
 *      u_oV = 0.01 × 50 / √3   = 0.5 / √3   → u² = 0.25 / 3   = 0.0833333
 *      u_gI = 0.002 × 1280 / √3 = 2.56 / √3 → u² = 6.5536 / 3 = 2.1845333
 *      u_oI = 0.02 × 128 / √3  = 2.56 / √3  → u² = 6.5536 / 3 = 2.1845333
 *      u(Wh) = √(14.9956 / 3) = √4.9985333 = 2.2357400 Wh;  U = 4.4714800 Wh
 */
const ACC = MeterAccuracySchema.parse({ voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.02 });
const HOURS = 5;
const RUN = { ah: 50, wh: 1280, loadSeconds: HOURS * 3600, voltSeconds: 25.6 * HOURS * 3600 };

describe('capacity uncertainty (JCGM 100, rectangular Type B, k = 2)', () => {
  it('a rectangular limit of ±√3 has a standard uncertainty of 1 (GUM 4.3.7)', () => {
    expect(rectangularStandard(Math.sqrt(3))).toBeCloseTo(1, 12);
  });

  it('matches the hand-worked example for Ah and Wh', () => {
    expect(ampHourStandardUncertainty(ACC, RUN)).toBeCloseTo(0.0816497, 6); // by hand, above
    expect(wattHourStandardUncertainty(ACC, RUN)).toBeCloseTo(2.2357400, 5); // by hand, above
    const u = capacityUncertainty(ACC, RUN);
    expect(u.coverageFactor).toBe(2);
    expect(u.expandedAh).toBeCloseTo(0.1632993, 6); // by hand, above
    expect(u.expandedWh).toBeCloseTo(4.4714800, 5); // by hand, above
    expect(u.method).toMatch(/JCGM 100/);
  });

  it('has no Wh uncertainty when the Wh is not known, and zero with a perfect meter', () => {
    expect(capacityUncertainty(ACC, { ...RUN, wh: null }).expandedWh).toBeNull();
    const perfect = { voltsGainPercent: 0, voltsOffsetVolts: 0, ampsGainPercent: 0, ampsOffsetAmps: 0 };
    expect(capacityUncertainty(perfect, RUN).expandedAh).toBe(0);
  });

  it('refuses a negative or absurd accuracy', () => {
    expect(MeterAccuracySchema.safeParse({ ...ACC, ampsGainPercent: -0.1 }).success).toBe(false);
    expect(MeterAccuracySchema.safeParse({ ...ACC, voltsGainPercent: 500 }).success).toBe(false);
  });
});

describe('verdict with the expanded uncertainty', () => {
  // Rated 50 Ah, acceptance 100 %: U = 0.1633 Ah = 0.3266 % of rated (example above).
  const uPct = (0.1632993 / 50) * 100;
  it('a margin inside ±U is borderline, on either side of the threshold', () => {
    expect(verdictWithUncertainty([{ percent: 100.2, expandedPercent: uPct }], 100)).toBe('borderline');
    expect(verdictWithUncertainty([{ percent: 99.8, expandedPercent: uPct }], 100)).toBe('borderline');
  });
  it('a margin beyond U stays pass or fail; without a U it is the plain verdict', () => {
    expect(verdictWithUncertainty([{ percent: 100.4, expandedPercent: uPct }], 100)).toBe('pass');
    expect(verdictWithUncertainty([{ percent: 99.6, expandedPercent: uPct }], 100)).toBe('fail');
    expect(verdictWithUncertainty([{ percent: 99.8, expandedPercent: null }], 100)).toBe('fail');
    expect(verdictWithUncertainty([{ percent: null, expandedPercent: null }], 100)).toBe('unrated');
  });
  it('a clear fail on one rating outweighs a borderline on the other', () => {
    expect(verdictWithUncertainty([{ percent: 100.1, expandedPercent: uPct }, { percent: 95, expandedPercent: uPct }], 100)).toBe('fail');
  });
});
