import { describe, expect, it } from 'vitest';
import { loadNasaB0005 } from '../../tests/fixtures/nasa-b0005.js';
import { createRunPipeline } from './run-pipeline.js';
import { summarizeRun } from './summarize-run.js';
import { RunSummarySchema } from '../schemas/run-summary.js';

// NASA Ames PCoE B0005 cycle 1 (tests/fixtures/README.md): rated 2 Ah, 2 A to 2.7 V,
// authors' capacity 1.8564874208181574 Ah ⇒ 92.82 % of rated.
describe('summarizeRun on the NASA B0005 discharge', () => {
  const config = { chemistry: 'other', endVolts: 2.7, ratedAh: 2, confirmReadings: 1, loadOnAmps: 0.5 } as const;
  const p = createRunPipeline(config);
  const { events, readings } = p.pushMany(loadNasaB0005());

  it('detects the end-voltage cutoff at the authors\' end-of-discharge sample with their capacity', () => {
    const cutoff = events.find((e) => e.type === 'cutoff')!;
    expect(cutoff).toMatchObject({ cause: 'end-voltage', t: 3346.937 });
    expect(Math.abs(cutoff.dischargeAh - 1.8564874208181574)).toBeLessThan(2e-15);
    expect(cutoff.dischargeWh).toBeCloseTo(6.593751, 6);
  });

  it('reports % of rated and fails the 100 % acceptance, passes a 90 % one', () => {
    const s = summarizeRun({ snapshot: p.snapshot(), events, readings });
    RunSummarySchema.parse(s);
    expect(s.percentRatedAh).toBeCloseTo(92.8244, 3);
    expect(s.verdict).toBe('fail');
    expect(summarizeRun({ snapshot: p.snapshot(), events, acceptancePercent: 90 }).verdict).toBe('pass');
    expect(s.cutoffCause).toBe('end-voltage');
    expect(s.meanAmps!).toBeGreaterThan(1.95); // a 2 A constant-current discharge (data set description)
    expect(s.meanAmps!).toBeLessThan(2.05);
    expect(s.cRate!).toBeCloseTo(s.meanAmps! / 2, 12);
    expect(s.readings).toBe(197);
    expect(s.maxTempCelsius!).toBeGreaterThan(s.minTempCelsius!);
    expect(s.correctedAh25C).toBeNull();
    expect(s.costPerKWh).toBeNull();
  });

  it('fills price, mass and the lead-acid correction when known', () => {
    const lead = createRunPipeline({ chemistry: 'lead-acid', cellsInSeries: 6, endVolts: 10.5, ratedAh: 100 });
    const frames = Array.from({ length: 3601 }, (_, t) => ({ t, volts: 12.2, amps: 25, clock: 'device' as const }));
    const ev = lead.pushMany(frames).events;
    const s = summarizeRun({ snapshot: lead.snapshot(), events: ev, price: 200, massKg: 30, leadAcidTempCelsius: 25 });
    expect(s.dischargeAh).toBeCloseTo(25, 9); // 25 A for 1 h
    expect(s.correctedAh25C!).toBeCloseTo(25, 9); // K_t = 1 at 25 °C
    expect(s.nominalVolts).toBeCloseTo(12, 12);
    expect(s.costPerKWh!).toBeCloseTo(200 / 0.305, 6);
    expect(s.whPerKg!).toBeCloseTo(305 / 30, 9);
    expect(s.meanWatts!).toBeCloseTo(305, 9); // 12.2 V × 25 A
    expect(s.meanVolts!).toBeCloseTo(12.2, 12);
  });
});
