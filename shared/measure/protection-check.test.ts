import { describe, expect, it } from 'vitest';
import type { Frame } from '../schemas/frame.js';
import { ProtectionExpectationSchema, type ProtectionExpectation } from '../schemas/protection-check.js';
import type { RunKind } from '../schemas/run.js';
import { createRunPipeline } from './run-pipeline.js';
import { summarizeRun } from './summarize-run.js';
import { withRunDetails } from './protection-summary.js';
import { noise, trace } from './synthetic-trace.test-helper.js';

/**
 * Protection checks on synthetic traces (1 Hz, seeded noise). Thresholds used as check values
 * are facts of the trade: LFP packs commonly refuse charge near 0 °C and heaters in heated
 * packs commonly switch on near 0 °C and off near 5 °C (common practice, no source); the
 * 2.5 V and 3.65 V a cell limits are usual LFP datasheet values (from memory).
 */
const expect1 = (p: Partial<ProtectionExpectation> & Pick<ProtectionExpectation, 'protection' | 'thresholdValue'>) => ProtectionExpectationSchema.parse(p);

function run(frames: Frame[], checks: ProtectionExpectation[], kind: RunKind = 'protection-check', extra: object = {}) {
  const p = createRunPipeline({ protectionChecks: checks, chemistry: 'lfp', cellsInSeries: 4, ratedAh: 50, ...extra });
  const { events } = p.pushMany(frames);
  const snapshot = p.snapshot();
  const summary = withRunDetails(summarizeRun({ snapshot, events }), snapshot, events, kind);
  return { events, summary, rows: summary.protections ?? [] };
}

describe('protection checks', () => {
  it('cold-charge inhibit: threshold, delay, release value and time until charging resumes', () => {
    const n = noise(21);
    // Cools 4 → −4 °C over t 0-400 (crosses 0 °C at t = 200); the BMS stops charge 5 s later,
    // then it warms from t = 400 and charging resumes at 3 °C (t = 400 + 7·50 = 750).
    const temp = (t: number) => (t <= 400 ? 4 - t / 50 : -4 + (t - 400) / 50);
    const frames = trace(0, 900, (t) => ({ volts: 13.3, amps: (t < 205 || t >= 750) ? -10 + n(0.02) : n(0.01), temps: { cell: temp(t) + n(0.002) } }));
    const { rows, events, summary } = run(frames, [expect1({ protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, releaseValue: 3, channel: 'cell' })]);
    expect(summary.verdict).toBe('not-applicable');
    expect(summary.percentRatedAh).toBeNull();
    const [row] = rows;
    expect(row).toMatchObject({ outcome: 'pass', trips: 1, beyondAtStart: false, unit: '°C', channel: 'cell' });
    // Within one sample period (1 s): at 1/50 °C a second the value moves 0.02 °C a sample.
    expect(Math.abs(row!.measuredDelaySeconds! - 5)).toBeLessThanOrEqual(1);
    expect(Math.abs(row!.measuredValue! - -0.1)).toBeLessThanOrEqual(0.03);
    expect(Math.abs(row!.releaseValue! - 3)).toBeLessThanOrEqual(0.03);
    expect(Math.abs(row!.resumeSeconds! - 545)).toBeLessThanOrEqual(1);
    expect(events.some((e) => e.type === 'protection-check-release' && e.elapsedSeconds === 750)).toBe(true);
    expect(row!.window!.fromSeconds).toBeLessThanOrEqual(200);
    expect(row!.window!.toSeconds).toBeGreaterThanOrEqual(750);
  });

  it('a pack already below 0 °C at the start is still recorded, and charging resuming after warming is an event', () => {
    // Issue 11 item 7: with the cold-charge check on and the pack at −4 °C from the first
    // reading, the charger never gets current in until the pack has warmed to 3 °C.
    const frames = trace(0, 600, (t) => ({ volts: 13.2, amps: t < 350 ? 0 : -10, temps: { cell: -4 + t / 50 } }));
    const { rows, events } = run(frames, [expect1({ protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, channel: 'cell' })]);
    const trip = events.find((e) => e.type === 'protection-check-trip');
    expect(trip).toMatchObject({ elapsedSeconds: 0, beyondAtStart: true, crossedElapsedSeconds: null, value: -4 });
    const release = events.find((e) => e.type === 'protection-check-release');
    expect(release).toMatchObject({ elapsedSeconds: 350, value: 3, resumeSeconds: 350 });
    expect(rows[0]).toMatchObject({ outcome: 'pass', beyondAtStart: true, measuredValue: null, measuredDelaySeconds: null, releaseValue: 3, resumeSeconds: 350 });
    expect(rows[0]!.notes.join(' ')).toMatch(/already past the threshold/i);
  });

  it('over-temperature on discharge: a delay outside the tolerance fails, and the tolerance is stated', () => {
    const frames = trace(0, 400, (t) => ({ volts: 12.9, amps: t < 130 ? 20 : 0, temps: { cell: 50 + t / 10, chamber: 70 + t / 10 } }));
    const { rows } = run(frames, [expect1({ protection: 'over-temp-discharge', thresholdValue: 60, delaySeconds: 10, channel: 'cell' })]);
    // Crosses 60 °C at t = 101 (first reading above), current stops at t = 130: 29 s, outside 10 ± 2 s.
    expect(rows[0]).toMatchObject({ outcome: 'fail', measuredDelaySeconds: 29, delayToleranceSeconds: 2, thresholdTolerance: 2 });
    expect(rows[0]!.notes.join(' ')).toMatch(/outside 10 ± 2.0 s/);
  });

  it('low-voltage cutoff and recovery: pack volts under load, the collapse, and the reconnect', () => {
    // 4 × 2.5 V = 10.0 V pack threshold; volts fall 0.01 V a second, the BMS opens 2 s after and
    // the terminals read 0 V until it reconnects 60 s later.
    const volts = (t: number) => 10.5 - t / 100;
    const frames = trace(0, 200, (t) => (t < 52 ? { volts: volts(t), amps: 20 } : t < 112 ? { volts: 0, amps: 0 } : { volts: 10.6, amps: 20 }));
    const { rows } = run(frames, [expect1({ protection: 'low-voltage', thresholdValue: 10, delaySeconds: 2, releaseValue: 10.2 })]);
    expect(rows[0]).toMatchObject({ outcome: 'pass', measuredDelaySeconds: 1, releaseValue: 10.6, resumeSeconds: 60 });
    expect(rows[0]!.measuredValue).toBeCloseTo(9.99, 9);
  });

  it('high-voltage cutoff on charge and over-current on discharge', () => {
    const hv = trace(0, 100, (t) => (t < 40 ? { volts: 14.4 + t / 100, amps: -10 } : { volts: 13.6, amps: 0 }));
    // 4 × 3.65 V = 14.6 V; crossed at t = 21 (14.61 V), current stops at t = 40: 19 s.
    const a = run(hv, [expect1({ protection: 'high-voltage', thresholdValue: 14.6, delaySeconds: 20 })]).rows[0]!;
    expect(a).toMatchObject({ outcome: 'pass', measuredDelaySeconds: 19 });
    expect(a.measuredValue).toBeCloseTo(14.79, 9);
    const oc = trace(0, 100, (t) => ({ volts: 12.8, amps: t >= 10 && t < 12 ? 101 : t < 10 ? 20 : t < 42 ? 0 : 20 }));
    const b = run(oc, [expect1({ protection: 'over-current', thresholdValue: 100, delaySeconds: 1 })]).rows[0]!;
    expect(b).toMatchObject({ outcome: 'pass', measuredValue: 101, measuredDelaySeconds: 2, resumeSeconds: 30 });
  });

  it('a protection whose signal never got past the threshold is "not reached", not a fail', () => {
    const frames = trace(0, 100, () => ({ volts: 13, amps: -5, temps: { cell: 20 } }));
    expect(run(frames, [expect1({ protection: 'cold-charge', thresholdValue: 0 })]).rows[0]!.outcome).toBe('not-reached');
  });

  it('a hot pack whose current never stops fails', () => {
    const frames = trace(0, 100, (t) => ({ volts: 13, amps: 10, temps: { cell: 55 + t / 10 } }));
    const row = run(frames, [expect1({ protection: 'over-temp-discharge', thresholdValue: 60, delaySeconds: 10 })]).rows[0]!;
    expect(row.outcome).toBe('fail');
    expect(row.notes.join(' ')).toMatch(/did not stop/);
  });

  it('heater on and off (PWM 2 s on, 1 s off): temperatures, mean and peak current', () => {
    // On near 0 °C and off near 5 °C (common practice for heated packs); 6 A pulses, 2/3 duty.
    const frames = trace(0, 800, (t) => {
      const heating = t >= 100 && t < 601;
      return { volts: 53, amps: -3, temps: { cell: t < 100 ? 1 - t / 100 : heating ? (t - 100) / 100 : 5 - (t - 601) / 100 }, aux: { heaterAmps: heating && (t - 100) % 3 < 2 ? 6 : 0 } };
    });
    const { rows } = run(frames, [expect1({ protection: 'heater-on', thresholdValue: 0 }), expect1({ protection: 'heater-off', thresholdValue: 5 })]);
    expect(rows[0]).toMatchObject({ outcome: 'pass', measuredValue: 0, peakHeaterAmps: 6 });
    expect(rows[1]).toMatchObject({ outcome: 'pass', measuredValue: 5, peakHeaterAmps: 6 });
    expect(rows[1]!.meanHeaterAmps!).toBeCloseTo(4, 1);
  });

  it('names each temperature channel\'s extremes, so the cell\'s peak is not the chamber\'s', () => {
    // Issue 11 item 7: the chamber peaked at 80.2 °C while the cell peaked at 72.0 °C.
    const frames = trace(0, 100, (t) => ({ volts: 13, amps: 5, temps: { cell: 62 + t / 10, chamber: 70.2 + t / 10 } }));
    const { summary } = run(frames, [], 'capacity-discharge');
    expect(summary.tempChannels).toEqual({ cell: { minCelsius: 62, maxCelsius: 72 }, chamber: { minCelsius: 70.2, maxCelsius: 80.2 } });
    expect(summary.verdict).not.toBe('not-applicable');
  });

  it('a restart mid-check (snapshot and restore) gives the same trip and release as an uninterrupted run', () => {
    const frames = trace(0, 900, (t) => ({ volts: 13.3, amps: t < 205 || t >= 750 ? -10 : 0, temps: { cell: t <= 400 ? 4 - t / 50 : -4 + (t - 400) / 50 } }));
    const checks = [expect1({ protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, channel: 'cell' })];
    const whole = createRunPipeline({ protectionChecks: checks }).pushMany(frames).events.filter((e) => e.type.startsWith('protection-check'));
    const first = createRunPipeline({ protectionChecks: checks });
    const before = first.pushMany(frames.slice(0, 203)).events;
    // JSON round trip, as the recorder stores it with each archive batch.
    const resumed = createRunPipeline({ protectionChecks: checks }, JSON.parse(JSON.stringify(first.snapshot())));
    const after = resumed.pushMany(frames.slice(203)).events;
    expect([...before, ...after].filter((e) => e.type.startsWith('protection-check'))).toEqual(whole);
    expect(whole.map((e) => e.type)).toEqual(['protection-check-trip', 'protection-check-release']);
  });
});
