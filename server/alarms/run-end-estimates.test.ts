import { describe, expect, it } from 'vitest';
import type { Reading } from '../../shared/schemas/reading.js';
import { RunEndEstimates, ratedWhOfConfig, type RunEstimateFacts } from './run-end-estimates.js';

/** A constant-power discharge: 12 V × 5 A = 60 W, so after t seconds 60·t/3600 Wh are out (P = V·I, E = P·t). */
function reading(t: number): Reading {
  const wh = (60 * t) / 3600;
  return { t, volts: 12, amps: 5, clock: 'device', elapsedSeconds: t, watts: 60, dischargeWh: wh, dischargeAh: (5 * t) / 3600, chargeWh: 0, chargeAh: 0 };
}

const discharge: RunEstimateFacts = { kind: 'capacity-discharge', config: { ratedWh: 100 } };

describe('RunEndEstimates (the near-end alarm reads the live estimate)', () => {
  it('gives the minutes to the end voltage of a constant-power discharge, worked by hand', () => {
    const estimates = new RunEndEstimates(() => discharge);
    for (let t = 0; t <= 600; t++) estimates.onReading(1, reading(t));
    // After 600 s at 60 W: 10 Wh out of 100 Wh rated, 90 Wh left at 60 W = 1.5 h = 90 min.
    expect(estimates.minutesToEnd(1)).toBeCloseTo(90, 9);
  });

  it('has no estimate for a charge run, an unknown run, or before enough readings', () => {
    const charge = new RunEndEstimates(() => ({ kind: 'charge', config: { ratedWh: 100 } }));
    for (let t = 0; t <= 600; t++) charge.onReading(1, reading(t));
    expect(charge.minutesToEnd(1)).toBeNull();
    const unknown = new RunEndEstimates(() => null);
    unknown.onReading(2, reading(0));
    expect(unknown.minutesToEnd(2)).toBeNull();
    const early = new RunEndEstimates(() => discharge);
    for (let t = 0; t < 5; t++) early.onReading(3, reading(t));
    expect(early.minutesToEnd(3)).toBeNull();
  });

  it('forgets a run that ended', () => {
    const estimates = new RunEndEstimates(() => discharge);
    for (let t = 0; t <= 600; t++) estimates.onReading(1, reading(t));
    estimates.forget(1);
    expect(estimates.minutesToEnd(1)).toBeNull();
  });

  it('takes the rated energy from the stated Wh, else rated Ah × nominal volts', () => {
    expect(ratedWhOfConfig({ ratedWh: 640, ratedAh: 50, chemistry: 'lfp', cellsInSeries: 4 })).toBe(640);
    // 4 cells × 3.2 V (LFP nominal, common practice) × 100 Ah = 1,280 Wh.
    expect(ratedWhOfConfig({ ratedAh: 100, chemistry: 'lfp', cellsInSeries: 4 })).toBeCloseTo(1280, 9);
    expect(ratedWhOfConfig({})).toBeNull();
  });
});
