import { describe, expect, it } from 'vitest';
import { RunEventSchema } from './run-event.js';
import { ReadingSchema } from './reading.js';
import { MeasureConfigSchema } from './measure-config.js';

describe('RunEventSchema', () => {
  it('accepts a complete cutoff and rejects one missing its fields', () => {
    const ok = { type: 'cutoff', elapsedSeconds: 10, cause: 'end-voltage', volts: 20, amps: 10, dischargeWh: 5, dischargeAh: 0.25 };
    expect(RunEventSchema.parse(ok)).toEqual(ok);
    expect(RunEventSchema.safeParse({ type: 'cutoff', elapsedSeconds: 10 }).success).toBe(false);
  });
  it('rejects an unknown type and a non-finite elapsedSeconds', () => {
    expect(RunEventSchema.safeParse({ type: 'explosion', elapsedSeconds: 1 }).success).toBe(false);
    expect(RunEventSchema.safeParse({ type: 'annotation', elapsedSeconds: Number.NaN, text: 'x' }).success).toBe(false);
  });
  it('accepts run marks', () => {
    expect(RunEventSchema.parse({ type: 'load-on', elapsedSeconds: 3 }).type).toBe('load-on');
  });
});

describe('ReadingSchema', () => {
  it('refuses negative totals (totals are magnitudes; the sign lives in amps)', () => {
    const r = { t: 1, volts: 3, amps: -1, elapsedSeconds: 0, watts: -3, dischargeWh: 0, dischargeAh: 0, chargeWh: -1, chargeAh: 0 };
    expect(ReadingSchema.safeParse(r).success).toBe(false);
    expect(ReadingSchema.safeParse({ ...r, chargeWh: 1 }).success).toBe(true);
  });
});

describe('MeasureConfigSchema', () => {
  it('fills defaults and refuses a zero rating', () => {
    // No explicit gap limit by default: it comes from the source's cadence (shared/measure/gap-limit.ts).
    expect(MeasureConfigSchema.parse({}).maxGapSeconds).toBeUndefined();
    expect(MeasureConfigSchema.parse({}).gapFactor).toBe(3);
    expect(MeasureConfigSchema.safeParse({ ratedAh: 0 }).success).toBe(false);
  });
});
