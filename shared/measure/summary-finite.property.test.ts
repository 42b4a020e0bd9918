import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ReadingSchema, RunEventSchema, RunSummarySchema, type Frame } from '../schemas/index.js';
import { createRunPipeline } from './run-pipeline.js';
import { summarizeRun } from './summarize-run.js';

// Property tests (fast-check, npm): whatever a meter or a person types, the core's readings,
// events and summaries hold finite numbers only (JSON has no Infinity, and the API's
// schemas refuse it), and a refused frame leaves the totals as they were.

/** Values a broken meter or a hostile line can carry (all finite: non-finite ones never pass FrameSchema). */
const extreme = fc.oneof(
  fc.double({ min: -60, max: 60, noNaN: true }),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(1e200, -1e200, Number.MAX_VALUE, -Number.MAX_VALUE, Number.MIN_VALUE, -Number.MIN_VALUE, 0, -0, 1e9, 1e9 + 1, 1e15, 1e16),
);
const step = fc.oneof(fc.double({ min: 0.001, max: 5, noNaN: true }), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(1e300, -1e300, 1e15, 0));
const frames = fc
  .array(fc.record({ dt: step, volts: extreme, amps: extreme, temp: extreme, heater: extreme }), { minLength: 1, maxLength: 80 })
  .map((rows) => {
    let t = 0;
    return rows.map((r): Frame => {
      t = Number.isFinite(t + r.dt) ? t + r.dt : r.dt;
      return { t, volts: r.volts, amps: r.amps, temps: { cell: r.temp }, aux: { heaterAmps: r.heater }, clock: 'device' };
    });
  });
/** A rating, price or mass anywhere from vanishing to enormous (the schemas only ask for positive and finite). */
const positive = fc.oneof(fc.double({ min: Number.MIN_VALUE, max: Number.MAX_VALUE, noNaN: true }), fc.constantFrom(Number.MIN_VALUE, 1e-300, 1, 50, 1e300));
const config = fc.record(
  { ratedAh: positive, ratedWh: positive, maxGapSeconds: positive, cellsInSeries: fc.integer({ min: 1, max: 2 ** 31 }), chemistry: fc.constantFrom('lfp' as const, 'lead-acid' as const, 'nmc' as const) },
  { requiredKeys: [] },
);

const allFinite = (value: unknown): boolean => {
  if (typeof value === 'number') return Number.isFinite(value);
  if (value && typeof value === 'object') return Object.values(value).every(allFinite);
  return true;
};

describe('no non-finite number ever leaves the measurement core', () => {
  it('readings, events and the summary stay finite and schema-valid for extreme frames and settings', () => {
    fc.assert(
      fc.property(config, frames, positive, positive, fc.double({ min: 0, max: 1e6, noNaN: true }), (cfg, fs, price, massKg, acceptancePercent) => {
        const pipeline = createRunPipeline(cfg);
        const events = [];
        for (const f of fs) {
          const { reading, events: es } = pipeline.push(f);
          if (reading) {
            expect(ReadingSchema.safeParse(reading).success).toBe(true);
            expect(allFinite(reading)).toBe(true);
          }
          for (const e of es) {
            expect(RunEventSchema.safeParse(e).success).toBe(true);
            events.push(e);
          }
        }
        const summary = summarizeRun({ snapshot: pipeline.snapshot(), events, price, massKg, acceptancePercent, leadAcidTempCelsius: 25 });
        expect(allFinite(summary)).toBe(true);
        // What the archive stores and the API sends: JSON, read back through the same schema.
        expect(RunSummarySchema.safeParse(JSON.parse(JSON.stringify(summary))).success).toBe(true);
      }),
      { numRuns: 400 },
    );
  });

  it('refuses a frame beyond the core\'s range and keeps the totals it had', () => {
    fc.assert(
      fc.property(frames, fc.constantFrom(1e200, -1e200, Number.MAX_VALUE, 1e10), (fs, huge) => {
        const pipeline = createRunPipeline({});
        pipeline.pushMany(fs);
        const before = pipeline.totals();
        const lastT = pipeline.snapshot().integrator.lastT ?? 0;
        const out = pipeline.push({ t: lastT + 1, volts: huge, amps: huge, clock: 'device' });
        expect(out).toMatchObject({ reading: null, outcome: 'out-of-range' });
        expect(pipeline.totals()).toEqual(before);
      }),
    );
  });

  it('counts the frame from the field report {"t":10,"volts":1e200,"amps":1e200} as refused, and the summary says so', () => {
    const pipeline = createRunPipeline({ ratedAh: 100 });
    pipeline.push({ t: 9, volts: 12.8, amps: 10, clock: 'arrival' });
    pipeline.push({ t: 10, volts: 1e200, amps: 1e200, clock: 'arrival' });
    pipeline.push({ t: 11, volts: 12.8, amps: 10, clock: 'arrival' });
    const summary = summarizeRun({ snapshot: pipeline.snapshot(), events: [] });
    // 10 A for 2 s = 20 A·s = 20/3600 Ah (exact arithmetic of the trapezoid on a constant current).
    expect(summary.dischargeAh).toBeCloseTo(20 / 3600, 15);
    expect(summary.rejectedReadings).toBe(1);
    expect(summary.readings).toBe(2);
  });
});
