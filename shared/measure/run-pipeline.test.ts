import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRunPipeline, resumeRunPipeline } from './run-pipeline.js';
import { noise, trace } from './synthetic-trace.test-helper.js';
import { ReadingSchema, RunEventSchema, type RunEvent, type RunTotals } from '../schemas/index.js';

// Trade arithmetic (common practice): an 8-cell LFP pack rated 50 Ah is 25.6 V nominal, 1,280 Wh.
const PACK = { chemistry: 'lfp', cellsInSeries: 8, endVoltsPerCell: 2.5, ratedAh: 50, ratedWh: 1280 } as const;
// A 0.2 C discharge (10 A) at a constant 25.6 V, sampled at 1 Hz for 6 h: analytic Ah = 10·t/3600.
const n = noise(11);
const frames = trace(0, 6 * 3600, () => ({ volts: 25.6 + n(0.01), amps: 10 + n(0.01), temps: { cell: 25 } }));

describe('run pipeline', () => {
  it('fires the 50 % and 100 % milestones of rated Ah and Wh, each once, near their analytic times', () => {
    const { events, readings } = createRunPipeline(PACK).pushMany(frames);
    const ms = events.filter((e) => e.type === 'milestone');
    expect(ms.map((e) => e.milestone).sort()).toEqual(['half-rated-ah', 'half-rated-wh', 'rated-ah', 'rated-wh']);
    const at = (k: string): number => ms.find((e) => e.milestone === k)!.elapsedSeconds;
    expect(Math.abs(at('half-rated-ah') - 9000)).toBeLessThanOrEqual(2); // 25 Ah at 10 A = 9000 s
    expect(Math.abs(at('rated-ah') - 18000)).toBeLessThanOrEqual(2); // 50 Ah at 10 A = 18000 s
    expect(Math.abs(at('rated-wh') - 18000)).toBeLessThanOrEqual(2); // 1280 Wh at 256 W = 18000 s
    for (const r of readings.slice(0, 50)) ReadingSchema.parse(r);
    for (const e of events) RunEventSchema.parse(e);
  });

  it('refuses bad frames without losing totals, and reports a gap', () => {
    const p = createRunPipeline({ maxGapSeconds: 10 });
    p.push({ t: 0, volts: 12, amps: 1, clock: 'device' });
    p.push({ t: 1, volts: 12, amps: 1, clock: 'device' });
    expect(p.push({ t: 2, volts: Number.NaN, amps: 1, clock: 'device' })).toMatchObject({ reading: null, outcome: 'non-finite' });
    expect(p.push({ t: 0.5, volts: 12, amps: 1, clock: 'device' }).outcome).toBe('backwards');
    const gap = p.push({ t: 100, volts: 12, amps: 1, clock: 'device' });
    expect(gap.events).toEqual([{ type: 'gap', elapsedSeconds: 1, endElapsedSeconds: 100, gapSeconds: 99 }]);
    expect(p.totals().dischargeAh).toBeCloseTo(1 / 3600, 15);
  });

  it('snapshot → JSON → restore mid-run gives the same readings and events as one pass', () => {
    const one = createRunPipeline(PACK).pushMany(frames);
    const a = createRunPipeline(PACK);
    const first = a.pushMany(frames.slice(0, 12_345));
    const b = createRunPipeline(PACK, JSON.parse(JSON.stringify(a.snapshot())));
    const second = b.pushMany(frames.slice(12_345));
    expect([...first.events, ...second.events]).toEqual(one.events);
    expect(b.totals()).toEqual(totalsOf(one.readings.at(-1)!));
    expect(second.readings.at(-1)).toEqual(one.readings.at(-1));
  });

  it('restores a cutoff state stored before the rename (run time as `t`, `cutoffT`) with the same events as one pass', () => {
    // 10 A with the volts falling linearly from 25.6 V to 19 V over 2 h: it crosses the 20 V end voltage (8 × 2.5 V).
    const falling = trace(0, 7200, (t) => ({ volts: 25.6 - (6.6 * t) / 7200, amps: 10, temps: { cell: 25 } }));
    const one = createRunPipeline(PACK).pushMany(falling);
    expect(one.events.some((e) => e.type === 'cutoff')).toBe(true);
    const a = createRunPipeline(PACK);
    // Stop while a cutoff waits for its confirmation: the candidate's run time is then in the stored state.
    const before: RunEvent[] = [];
    let split = 0;
    while (split < falling.length && (a.snapshot().detector.cutoff.candidate ?? null) === null) before.push(...a.push(falling[split++]!).events);
    expect(split).toBeLessThan(falling.length);
    const stored = JSON.parse(JSON.stringify(a.snapshot())) as { detector: { cutoff: Record<string, unknown> & { candidate: Record<string, unknown>; prev: Record<string, unknown> } } };
    const cutoff = stored.detector.cutoff;
    const old = (o: Record<string, unknown>, from: string, to: string) => { o[to] = o[from]; delete o[from]; }; // vocab-rename: keep
    old(cutoff.candidate, 'elapsedSeconds', 't'); // vocab-rename: keep
    old(cutoff.prev, 'elapsedSeconds', 't'); // vocab-rename: keep
    old(cutoff, 'cutoffElapsedSeconds', 'cutoffT'); // vocab-rename: keep
    const b = createRunPipeline(PACK, stored);
    const rest = b.pushMany(falling.slice(split));
    expect([...before, ...rest.events]).toEqual(one.events);
    expect(b.totals()).toEqual(totalsOf(one.readings.at(-1)!));
  });

  it('refuses a corrupt snapshot with a clear error', () => {
    expect(() => createRunPipeline(PACK, { version: 1, config: {} })).toThrow();
  });

  it('resumes from archived totals without firing passed milestones again', () => {
    const p = resumeRunPipeline(PACK, { dischargeAh: 30, dischargeWh: 768, chargeAh: 0, chargeWh: 0 }, 0);
    const { events } = p.pushMany(trace(20_000, 20_000 + 2 * 3600, () => ({ volts: 25.6, amps: 10 })));
    expect(events.filter((e) => e.type === 'milestone').map((e) => e.milestone).sort()).toEqual(['rated-ah', 'rated-wh']);
    expect(p.totals().dischargeAh).toBeCloseTo(50, 9);
  });

  it('property: chunked feeding gives the same totals and events as one pass (fast-check)', () => {
    const small = frames.slice(0, 2000);
    const whole = createRunPipeline(PACK).pushMany(small);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 2000 }), { maxLength: 5 }), (cuts) => {
        const bounds = [...new Set([0, ...cuts, 2000])].sort((x, y) => x - y);
        let snap: unknown;
        const events: RunEvent[] = [];
        for (let i = 1; i < bounds.length; i++) {
          const p = createRunPipeline(PACK, snap);
          events.push(...p.pushMany(small.slice(bounds[i - 1], bounds[i])).events);
          snap = JSON.parse(JSON.stringify(p.snapshot()));
        }
        expect(createRunPipeline(PACK, snap).totals()).toEqual(totalsOf(whole.readings.at(-1)!));
        expect(events).toEqual(whole.events);
      }),
      { numRuns: 30 },
    );
  });
});

function totalsOf(r: RunTotals): RunTotals {
  return { dischargeWh: r.dischargeWh, dischargeAh: r.dischargeAh, chargeWh: r.chargeWh, chargeAh: r.chargeAh };
}
