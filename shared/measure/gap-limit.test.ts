import { describe, expect, it } from 'vitest';
import { createRunPipeline } from './run-pipeline.js';
import { integrateColumns } from './integrator.js';
import { DEFAULT_MAX_GAP_SECONDS, MIN_GAP_SECONDS, resolveGapLimit } from './gap-limit.js';
import { summarizeRun } from './summarize-run.js';
import type { Frame } from '../schemas/frame.js';
import type { MeasureConfigInput } from '../schemas/measure-config.js';

const HOUR_S = 3600;
const REL_TOLERANCE = 1e-9;

/** Constant-current frames every `stepSeconds` from 0 to `endSeconds`, with a last frame at `endSeconds` itself. */
function constantLog(stepSeconds: number, endSeconds: number, volts: number, amps: number): Frame[] {
  const out: Frame[] = [];
  for (let t = 0; t < endSeconds; t += stepSeconds) out.push({ t, volts, amps, clock: 'device' });
  out.push({ t: endSeconds, volts, amps, clock: 'device' });
  return out;
}

function runLog(frames: Frame[], config: MeasureConfigInput) {
  const p = createRunPipeline(config);
  const { events } = p.pushMany(frames);
  return { totals: p.totals(), gaps: events.filter((e) => e.type === 'gap'), pipeline: p, events };
}

const relErr = (got: number, want: number): number => Math.abs(got - want) / want;

describe('gap limit: resolved from the source cadence', () => {
  it('takes an explicit limit as typed, else 3 × the cadence (not below the floor), else the default', () => {
    expect(resolveGapLimit({ maxGapSeconds: 12, cadenceSeconds: 60 })).toMatchObject({ seconds: 12, basis: 'explicit' });
    expect(resolveGapLimit({ cadenceSeconds: 60 })).toMatchObject({ seconds: 180, basis: 'cadence', cadenceSeconds: 60 });
    expect(resolveGapLimit({ cadenceSeconds: 60, gapFactor: 5 }).seconds).toBe(300);
    expect(resolveGapLimit({ cadenceSeconds: 0.05 }).seconds).toBe(MIN_GAP_SECONDS);
    expect(resolveGapLimit({})).toMatchObject({ seconds: DEFAULT_MAX_GAP_SECONDS, basis: 'default' });
  });
});

describe('gap limit: logs at any cadence integrate to the analytic Ah', () => {
  // Analytic: constant current I for T seconds delivers I·T/3600 Ah; the trapezoid rule is exact for a constant.
  for (const stepSeconds of [1, 60, 300]) {
    it(`a ${stepSeconds} s log of 8 A for 10 h gives 80 Ah within 1e-9 relative, with no gap`, () => {
      const { totals, gaps } = runLog(constantLog(stepSeconds, 10 * HOUR_S, 12.8, 8), { cadenceSeconds: stepSeconds });
      expect(relErr(totals.dischargeAh, 80)).toBeLessThan(REL_TOLERANCE);
      expect(relErr(totals.dischargeWh, 80 * 12.8)).toBeLessThan(REL_TOLERANCE);
      expect(gaps).toHaveLength(0);
      // The array form resolves the same limit from the same cadence.
      const frames = constantLog(stepSeconds, 10 * HOUR_S, 12.8, 8);
      const cols = integrateColumns(frames.map((f) => f.t), frames.map((f) => f.volts), frames.map((f) => f.amps), { cadenceSeconds: stepSeconds });
      expect(relErr(cols.dischargeAh, 80)).toBeLessThan(REL_TOLERANCE);
    });
  }

  it('a 1 s log with a real 10-minute hole still reports the gap and leaves the hole out', () => {
    // Analytic: 8 A for 3600 s minus the 600 s hole = 8 × 3000 / 3600 Ah.
    const frames = constantLog(1, HOUR_S, 12.8, 8).filter((f) => f.t <= 1000 || f.t >= 1600);
    const { totals, gaps } = runLog(frames, { cadenceSeconds: 1 });
    expect(gaps).toEqual([{ type: 'gap', elapsedSeconds: 1000, endElapsedSeconds: 1600, gapSeconds: 600 }]);
    expect(relErr(totals.dischargeAh, (8 * 3000) / HOUR_S)).toBeLessThan(REL_TOLERANCE);
  });

  it('a 60 s log with a hole of four cadences reports it; two missed readings are integrated', () => {
    const missTwo = constantLog(60, HOUR_S, 12, 5).filter((f) => f.t !== 600 && f.t !== 660);
    expect(runLog(missTwo, { cadenceSeconds: 60 }).gaps).toHaveLength(0);
    const missThree = constantLog(60, HOUR_S, 12, 5).filter((f) => f.t < 600 || f.t > 720);
    expect(runLog(missThree, { cadenceSeconds: 60 }).gaps).toEqual([{ type: 'gap', elapsedSeconds: 540, endElapsedSeconds: 780, gapSeconds: 240 }]);
  });
});

describe('gap limit: the numbers of issue 11, item 1', () => {
  for (const pollSeconds of [31, 45, 60]) {
    it(`1 h at 5 A polled every ${pollSeconds} s gives 5 Ah (the fixed 30 s rule gave 0 Ah)`, () => {
      // Analytic: 5 A × 1 h = 5 Ah.
      const frames = constantLog(pollSeconds, HOUR_S, 13.2, 5);
      expect(runLog(frames, { cadenceSeconds: pollSeconds }).totals.dischargeAh).toBeCloseTo(5, 9);
      // Without the cadence, the 30 s default treats every step as a gap: what the fix is for.
      expect(runLog(frames, {}).totals.dischargeAh).toBeLessThan(0.01);
    });
  }

  it('315 rows at 60 s of 10 A give the analytic Wh and no gap events (were 0.0 Wh and 314 gaps)', () => {
    // Analytic: 314 intervals × 60 s = 18,840 s; 10 A × 12.8 V × 18,840 s / 3600 = 669.866… Wh.
    const frames = Array.from({ length: 315 }, (_, i): Frame => ({ t: i * 60, volts: 12.8, amps: 10, clock: 'device' }));
    const { totals, gaps, pipeline, events } = runLog(frames, { cadenceSeconds: 60 });
    expect(gaps).toHaveLength(0);
    expect(relErr(totals.dischargeWh, (10 * 12.8 * 18_840) / HOUR_S)).toBeLessThan(REL_TOLERANCE);
    const summary = summarizeRun({ snapshot: pipeline.snapshot(), events });
    expect(summary).toMatchObject({ gaps: 0, maxGapSeconds: 180, gapLimitBasis: 'cadence', cadenceSeconds: 60 });
  });

  it('an explicit limit given on the run wins over the cadence', () => {
    const frames = constantLog(60, HOUR_S, 12.8, 10);
    const { gaps } = runLog(frames, { cadenceSeconds: 60, maxGapSeconds: 30 });
    expect(gaps).toHaveLength(60);
  });
});
