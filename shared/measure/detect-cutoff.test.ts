import { describe, expect, it } from 'vitest';
import { createRunPipeline } from './run-pipeline.js';
import { noise, trace } from './synthetic-trace.test-helper.js';
import type { RunEvent } from '../schemas/run-event.js';

// Synthetic traces with known answers (analytic ramps plus seeded noise). The protection's
// reconnect "after a couple of minutes" is common practice for pack BMSs; the 2.5 V/cell LFP
// end voltage is common practice. Event times are checked to one sample.
const LFP_8S = { chemistry: 'lfp', cellsInSeries: 8, endVoltsPerCell: 2.5 } as const; // 20 V end
const types = (events: RunEvent[]): string[] => events.map((e) => e.type + ('milestone' in e ? `:${e.milestone}` : ''));

describe('end-voltage cutoff', () => {
  it('fires once when a noisy falling voltage crosses the end voltage, with Wh/Ah at that moment', () => {
    const n = noise(1);
    // Volts fall 26 → 19 V over 1000 s at 10 A: the clean trace crosses 20 V at t = 857.14 s.
    const frames = trace(0, 1000, (t) => ({ volts: 26 - (7 * t) / 1000 + n(0.03), amps: 10 + n(0.05) }));
    const p = createRunPipeline({ ...LFP_8S, hysteresisVolts: 0.2 });
    const { events, readings } = p.pushMany(frames);
    const cutoffs = events.filter((e) => e.type === 'cutoff');
    expect(cutoffs).toHaveLength(1);
    const c = cutoffs[0]!;
    expect(c.cause).toBe('end-voltage');
    expect(Math.abs(c.elapsedSeconds - 857.14)).toBeLessThan(6); // noise 0.03 V at 0.007 V/s moves it ≤ 4.3 s, + one sample
    // Interpolated between the readings either side of the crossing: Ah between their totals.
    const before = readings.filter((r) => r.elapsedSeconds <= c.elapsedSeconds).at(-1)!;
    const after = readings.find((r) => r.elapsedSeconds > c.elapsedSeconds)!;
    expect(c.dischargeAh).toBeGreaterThanOrEqual(before.dischargeAh);
    expect(c.dischargeAh).toBeLessThanOrEqual(after.dischargeAh);
    expect(c.dischargeAh).toBeCloseTo((10 * c.elapsedSeconds) / 3600, 2);
    expect(c.volts).toBe(20);
    expect(types(events)).toContain('milestone:near-end-voltage');
  });

  it('a trace hovering at the end voltage gives one cutoff and one warning, not many', () => {
    const n = noise(2);
    const frames = trace(0, 3000, (t) => ({ volts: t < 100 ? 22 : 20 + n(0.1), amps: 10 + n(0.05) }));
    const p = createRunPipeline({ ...LFP_8S, hysteresisVolts: 0.3, warnMarginVolts: 0.5 });
    const { events } = p.pushMany(frames);
    expect(events.filter((e) => e.type === 'cutoff')).toHaveLength(1);
    expect(types(events).filter((x) => x === 'milestone:near-end-voltage')).toHaveLength(1);
  });

  it('an electronic load that stops itself at the end voltage is an end-voltage cutoff, not a protection one', () => {
    const frames = trace(0, 200, (t) => (t < 100 ? { volts: 20.5 - t / 100, amps: 10 } : { volts: 24, amps: 0 }));
    const { events } = createRunPipeline({ ...LFP_8S, confirmReadings: 3 }).pushMany(frames);
    const cutoffs = events.filter((e) => e.type === 'cutoff');
    expect(cutoffs).toHaveLength(1);
    // The reading at exactly 20.0 V (t = 50) has reached the end voltage (≤, not <).
    expect(cutoffs[0]).toMatchObject({ cause: 'end-voltage', elapsedSeconds: 50 });
  });

  it('the operator switching the load off (aux.loadOn = 0) is not a cutoff', () => {
    const frames = trace(0, 100, (t) => (t < 50 ? { volts: 25, amps: 10, aux: { loadOn: 1 } } : { volts: 26, amps: 0, aux: { loadOn: 0 } }));
    expect(createRunPipeline(LFP_8S).pushMany(frames).events).toEqual([]);
  });
});

describe('protection cutoff and recovery', () => {
  it('voltage collapse: cutoff with the last voltage under load, recovery ~120 s later', () => {
    const n = noise(3);
    const frames = trace(0, 900, (t) => {
      if (t < 500) return { volts: 25.2 - t / 1000 + n(0.02), amps: 10 + n(0.05) };
      if (t < 620) return { volts: Math.abs(n(0.02)), amps: n(0.01) }; // protection open: terminals collapse
      return { volts: 25.9 + n(0.02), amps: 10 + n(0.05) }; // reconnected, load draws again
    });
    const { events } = createRunPipeline(LFP_8S).pushMany(frames);
    const cutoff = events.find((e) => e.type === 'cutoff')!;
    expect(cutoff).toMatchObject({ cause: 'protection', signal: 'voltage-collapse', elapsedSeconds: 500 });
    expect(cutoff.volts).toBeCloseTo(24.701, 1);
    const rec = events.find((e) => e.type === 'recovery')!;
    expect(rec).toMatchObject({ cutoffElapsedSeconds: 500, elapsedSeconds: 620 });
    expect(rec.recoverySeconds).toBe(120);
    expect(events.filter((e) => e.type === 'cutoff')).toHaveLength(1);
  });

  it('current falls to ~0 A with the load on: protection cutoff, recovery when current resumes', () => {
    const n = noise(4);
    const frames = trace(0, 600, (t) => {
      if (t < 300) return { volts: 25.5 + n(0.02), amps: 10 + n(0.05), aux: { loadOn: 1 } };
      if (t < 400) return { volts: 26.2 + n(0.02), amps: n(0.01), aux: { loadOn: 1 } };
      return { volts: 25.5 + n(0.02), amps: 10 + n(0.05), aux: { loadOn: 1 } };
    });
    const { events } = createRunPipeline(LFP_8S).pushMany(frames);
    // The discharge goes on after the reconnect: said with a load-on, so the trip did not end the test.
    expect(types(events)).toEqual(['cutoff', 'recovery', 'load-on']);
    expect(events[0]).toMatchObject({ cause: 'protection', signal: 'current-zero', elapsedSeconds: 300 });
    expect(events[1]).toMatchObject({ recoverySeconds: 100 });
  });

  it('a single-reading dropout is not a cutoff (confirmation count)', () => {
    const frames = trace(0, 100, (t) => (t === 50 ? { volts: 0.1, amps: 0 } : { volts: 25, amps: 10 }));
    expect(createRunPipeline(LFP_8S).pushMany(frames).events).toEqual([]);
  });
});

describe('hysteresis property (fast-check)', () => {
  it('any noisy trace hovering at the end voltage, noise within the band, gives exactly one cutoff', async () => {
    const fc = (await import('fast-check')).default;
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 }), fc.double({ min: 0.01, max: 0.14, noNaN: true }), (seed, amplitude) => {
        const n = noise(seed);
        const frames = trace(0, 600, (t) => ({ volts: t < 10 ? 22 : 20 + n(amplitude), amps: 10 + n(0.05) }));
        const { events } = createRunPipeline({ ...LFP_8S, hysteresisVolts: 0.3, warnMarginVolts: 0.5 }).pushMany(frames);
        expect(events.filter((e) => e.type === 'cutoff')).toHaveLength(1);
      }),
      { numRuns: 40 },
    );
  });
});
