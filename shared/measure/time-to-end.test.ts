import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EndEstimator, estimateTimeToEnd, TIME_TO_END_MAX_SECONDS, type EstimatorReading } from './time-to-end.js';
import { SECONDS_PER_HOUR } from '../units/time.js';


/** Readings once a second at a constant volts and amps, with the energy integrated exactly (E = V·I·t). */
function constantPower(volts: number, amps: number, seconds: number, startWh = 0): EstimatorReading[] {
  return Array.from({ length: seconds + 1 }, (_, t) => ({ elapsedSeconds: t, volts, amps, dischargeWh: startWh + (volts * amps * t) / SECONDS_PER_HOUR }));
}

describe('estimateTimeToEnd', () => {
  it('constant power: the rated energy left over the power, computed by hand', () => {
    // Hand computation (E = P·t, common practice): 12 V × 5 A = 60 W. After 600 s the pack has
    // given 60 W × 600 s = 36 000 J = 10 Wh. Rated 100 Wh leaves 90 Wh; 90 Wh / 60 W = 1.5 h = 5400 s.
    // 10 Wh of 100 Wh = 10 % of rated.
    const e = estimateTimeToEnd(constantPower(12, 5, 600), 100);
    expect(e.secondsToEnd).toBeCloseTo(5400, 6);
    expect(e.percentOfRated).toBeCloseTo(10, 9);
  });

  it('averages a rippling load: 40 W and 80 W in turn estimate as 60 W (time-weighted mean)', () => {
    const rs: EstimatorReading[] = [{ elapsedSeconds: 0, volts: 10, amps: 4, dischargeWh: 0 }];
    for (let t = 1; t <= 600; t++) {
      const watts = t % 2 === 0 ? 80 : 40;
      rs.push({ elapsedSeconds: t, volts: 10, amps: watts / 10, dischargeWh: rs.at(-1)!.dischargeWh + watts / SECONDS_PER_HOUR });
    }
    // 600 s at a mean 60 W = 10 Wh, so the same 5400 s as the constant case (hand computed above).
    expect(estimateTimeToEnd(rs, 100).secondsToEnd).toBeCloseTo(5400, 0);
  });

  it('is hidden without a rating (and % of rated too)', () => {
    expect(estimateTimeToEnd(constantPower(12, 5, 600), null)).toEqual({ secondsToEnd: null, percentOfRated: null });
    expect(estimateTimeToEnd(constantPower(12, 5, 600), 0)).toEqual({ secondsToEnd: null, percentOfRated: null });
  });

  it('is hidden with no load, keeping % of rated', () => {
    const rs = constantPower(12, 5, 600);
    rs.push({ elapsedSeconds: 601, volts: 12.3, amps: 0, dischargeWh: rs.at(-1)!.dischargeWh });
    const e = estimateTimeToEnd(rs, 100);
    expect(e.secondsToEnd).toBeNull();
    expect(e.percentOfRated).toBeCloseTo(10, 9);
  });

  it('is hidden while the voltage rises (recovery or charge)', () => {
    const rs = constantPower(12, 5, 600).map((r) => ({ ...r, volts: 12 + 0.001 * r.elapsedSeconds }));
    expect(estimateTimeToEnd(rs, 100).secondsToEnd).toBeNull();
    // A falling voltage is the normal case and is estimated.
    const falling = constantPower(12, 5, 600).map((r) => ({ ...r, volts: 12 - 0.001 * r.elapsedSeconds }));
    expect(estimateTimeToEnd(falling, 100).secondsToEnd).not.toBeNull();
  });

  it('is hidden with too few readings or too short a span', () => {
    expect(estimateTimeToEnd(constantPower(12, 5, 5), 100).secondsToEnd).toBeNull();
    const dense = Array.from({ length: 30 }, (_, i) => ({ elapsedSeconds: i * 0.5, volts: 12, amps: 5, dischargeWh: (60 * i * 0.5) / SECONDS_PER_HOUR }));
    expect(estimateTimeToEnd(dense, 100).secondsToEnd).toBeNull(); // 14.5 s span
    expect(estimateTimeToEnd([], 100)).toEqual({ secondsToEnd: null, percentOfRated: null });
  });

  it('is hidden once the rating is used up, and past its bound', () => {
    const past = estimateTimeToEnd(constantPower(12, 5, 600, 105), 100);
    expect(past.secondsToEnd).toBeNull();
    expect(past.percentOfRated).toBeCloseTo(115, 9);
    // 0.06 A at 1 V = 0.06 W; 1000 Wh would take 16 667 h, past the 100 h bound.
    expect(estimateTimeToEnd(constantPower(1, 0.06, 600), 1000).secondsToEnd).toBeNull();
    // A wildly wrong rating (pack gave 4× it) hides % of rated rather than print 400 %.
    expect(estimateTimeToEnd(constantPower(12, 5, 600, 30), 10).percentOfRated).toBeNull();
  });

  it('never answers a negative, non-finite or out-of-bound number for any discharge', () => {
    fc.assert(fc.property(
      fc.double({ min: 0.1, max: 60, noNaN: true }), fc.double({ min: 0, max: 200, noNaN: true }),
      fc.double({ min: 0, max: 5000, noNaN: true }), fc.double({ min: 0.001, max: 10_000, noNaN: true }),
      (volts, amps, startWh, ratedWh) => {
        const e = estimateTimeToEnd(constantPower(volts, amps, 120, startWh), ratedWh);
        if (e.secondsToEnd !== null) {
          expect(e.secondsToEnd).toBeGreaterThan(0);
          expect(e.secondsToEnd).toBeLessThanOrEqual(TIME_TO_END_MAX_SECONDS);
        }
        if (e.percentOfRated !== null) expect(Number.isFinite(e.percentOfRated)).toBe(true);
      },
    ));
  });
});

describe('EndEstimator', () => {
  it('keeps only the recent window and ignores readings out of order or not finite', () => {
    const est = new EndEstimator(100);
    let last = { secondsToEnd: null as number | null, percentOfRated: null as number | null };
    // 300 s at 30 W, then 300 s at 60 W: after the switch the 120 s window holds only 60 W.
    let wh = 0;
    for (let t = 0; t <= 600; t++) {
      const watts = t <= 300 ? 30 : 60;
      if (t > 0) wh += watts / SECONDS_PER_HOUR;
      last = est.push({ elapsedSeconds: t, volts: 12, amps: watts / 12, dischargeWh: wh });
    }
    // Energy: 300 s × 30 W + 300 s × 60 W = 27 000 J = 7.5 Wh; 92.5 Wh left at 60 W = 5550 s (hand computed).
    expect(last.secondsToEnd).toBeCloseTo(5550, 6);
    expect(est.push({ elapsedSeconds: 10, volts: 12, amps: 5, dischargeWh: 0 }).secondsToEnd).toBeCloseTo(5550, 6);
    expect(est.push({ elapsedSeconds: 700, volts: Number.NaN, amps: 5, dischargeWh: 9 }).secondsToEnd).toBeCloseTo(5550, 6);
  });
});
