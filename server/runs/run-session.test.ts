import { describe, expect, it } from 'vitest';
import type { Run } from '../../shared/schemas/run.js';
import { measureConfigFor } from './measure-config.js';
import { RunSession } from './run-session.js';
import { SerialSourceConfigSchema, sourceCadenceSeconds } from '../../shared/schemas/bench.js';

const baseRun = (over: Partial<Run> = {}): Run => ({
  id: 1, name: 'r', tags: [], origin: 'live', benchId: 1, batteryId: null, kind: 'capacity-discharge', state: 'armed',
  endVolts: { mode: 'absolute', volts: 10 }, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual',
  targetAh: null, targetWh: null, afterRecoverySeconds: 0, readingsCount: 0, summary: null, startedAt: null, endedAt: null,
  createdBy: null, createdAt: '', updatedAt: '', ...over,
});
const session = (over: Partial<Run> = {}) => {
  const run = baseRun(over);
  return new RunSession(run, null, measureConfigFor(run, null));
};

describe('RunSession', () => {
  it('goes armed → recording on the first reading and cutoff at the end voltage, with an alarm', () => {
    const s = session();
    expect(s.push({ t: 0, volts: 12, amps: 5, clock: 'device' }).stateChanged).toBe(true);
    expect(s.state).toBe('recording');
    let events: string[] = [];
    for (let i = 1; i < 20; i++) events = events.concat(s.push({ t: i, volts: i < 10 ? 12 : 9.5, amps: 5, clock: 'device' }).events.map((e) => e.event.type));
    expect(s.state).toBe('cutoff');
    expect(events.filter((e) => e === 'cutoff')).toHaveLength(1);
    expect(events.filter((e) => e === 'alarm')).toHaveLength(1);
    // The end-voltage cutoff ends an after-recovery run (no reconnect follows it); manual never ends by itself.
    expect(s.shouldFinish()).toBe(false);
  });

  it('corrects a cold lead-acid run up by the electrolyte temperature typed on the run', () => {
    const run = baseRun({ endVolts: null, electrolyteTempCelsius: 10 });
    const battery = { id: 1, label: 'LA', brand: 'Northgate Cell Lab', chemistry: 'lead-acid', cellsInSeries: 6, ratedAh: 100, ratedWh: null, price: null, massKg: null, protectionSpecs: [] };
    const s = new RunSession(run, battery, measureConfigFor(run, battery));
    for (let i = 0; i <= 3600; i++) s.push({ t: i, volts: 12.2, amps: 25, clock: 'device' });
    s.end('finished');
    // 25 A for 1 h = 25 Ah; at 10 °C (50 °F) credited by the factor 1.19 (IEEE 450 table, from memory).
    expect(s.summary()!.capacityAh).toBeCloseTo(25, 9);
    expect(s.summary()!.correctedAh25C).toBeCloseTo(25 * 1.19, 9);
  });

  it('stops a target-Ah run once the discharged charge reaches the target', () => {
    // 3.6 A for 1,000 s = 1 Ah (constant current, exact).
    const s = session({ stopWhen: 'target-ah', targetAh: 1, endVolts: null });
    for (let i = 0; i < 1000; i++) s.push({ t: i, volts: 12, amps: 3.6, clock: 'device' });
    expect(s.shouldFinish()).toBe(false);
    s.push({ t: 1000, volts: 12, amps: 3.6, clock: 'device' });
    expect(s.shouldFinish()).toBe(true);
  });

  it('finishes an after-recovery run the set time after an end-voltage cutoff', () => {
    const s = session({ stopWhen: 'after-recovery', afterRecoverySeconds: 5 });
    for (let i = 0; i < 40; i++) s.push({ t: i, volts: i < 10 ? 12 : 9, amps: 5, clock: 'device' });
    expect(s.shouldFinish()).toBe(true);
  });

  it('hands each reading to the archive exactly once, with the state to resume from', () => {
    const s = session();
    for (let i = 0; i < 5; i++) s.push({ t: i, volts: 12, amps: 1, clock: 'device' });
    const a = s.takeBatch();
    for (let i = 5; i < 8; i++) s.push({ t: i, volts: 12, amps: 1, clock: 'device' });
    const b = s.takeBatch();
    expect([a.firstSeq, a.readings.length, b.firstSeq, b.readings.length]).toEqual([0, 5, 5, 3]);
    expect(a.patch.state).toBe('recording');
    expect(b.patch.state).toBeUndefined();
    const resumed = new RunSession(baseRun({ state: 'recording' }), null, measureConfigFor(baseRun(), null), JSON.parse(b.patch.pipelineState!));
    expect(resumed.readingsCount).toBe(8);
    resumed.push({ t: 8, volts: 12, amps: 1, clock: 'device' });
    // 8 s at 1 A across the hand-over: 8/3600 Ah.
    expect(resumed.pipeline.totals().dischargeAh).toBeCloseTo(8 / 3600, 15);
    expect(s.hasPending()).toBe(false);
  });

  it('integrates a meter polled every 60 s: the gap limit comes from the bench\'s poll period', () => {
    // Analytic: 5 A for 1 h = 5 Ah. The bench polls a SCPI meter once a minute (pollMs 60,000, the most a bench allows).
    const source = SerialSourceConfigSchema.parse({ kind: 'serial', path: '/dev/ttyUSB0', format: { kind: 'scpi', pollMs: 60_000 } });
    const cadenceSeconds = sourceCadenceSeconds(source);
    expect(cadenceSeconds).toBe(60);
    const run = baseRun({ endVolts: null });
    const s = new RunSession(run, null, measureConfigFor(run, null, { cadenceSeconds }));
    const events: string[] = [];
    for (let t = 0; t <= 3600; t += 60) events.push(...s.push({ t, volts: 12, amps: 5, clock: 'device' }).events.map((e) => e.event.type));
    expect(s.pipeline.totals().dischargeAh).toBeCloseTo(5, 12);
    expect(events).not.toContain('gap');
    expect(s.summary()).toMatchObject({ maxGapSeconds: 180, gapLimitBasis: 'cadence' });
  });

  it('takes a gap limit typed on the run over the bench\'s cadence', () => {
    const run = baseRun({ endVolts: null, maxGapSeconds: 90 });
    const s = new RunSession(run, null, measureConfigFor(run, null, { cadenceSeconds: 1 }));
    s.push({ t: 0, volts: 12, amps: 5, clock: 'device' });
    expect(s.push({ t: 60, volts: 12, amps: 5, clock: 'device' }).events).toHaveLength(0);
    expect(s.summary()).toMatchObject({ maxGapSeconds: 90, gapLimitBasis: 'explicit' });
  });

  it('a load that stops itself at exactly the end voltage ends an after-recovery run (was a "protection" cutoff that never finished)', () => {
    const s = session({ stopWhen: 'after-recovery', afterRecoverySeconds: 5 });
    // 5 A; volts fall 10.5 → 10.0 V (the end voltage, reached exactly at t = 50), then the load stops and the pack rests at 10.4 V.
    for (let t = 0; t <= 80; t++) s.push({ t, volts: t <= 50 ? 10.5 - t / 100 : 10.4, amps: t <= 50 ? 5 : 0, clock: 'device' });
    expect(s.summary()).toMatchObject({ cutoffCause: 'end-voltage', capacityEndedBy: 'end-voltage' });
    expect(s.shouldFinish()).toBe(true);
  });

  it('a protection trip that reconnects does not finish an after-recovery run unless the run says a trip ends the test', () => {
    const feed = (s: RunSession) => {
      for (let t = 0; t <= 300; t++) {
        const open = t > 100 && t <= 160;
        s.push({ t, volts: open ? 0.05 : 12, amps: open ? 0 : 5, clock: 'device' });
      }
    };
    const runsOn = session({ stopWhen: 'after-recovery', afterRecoverySeconds: 10 });
    feed(runsOn);
    expect(runsOn.state).toBe('recovered');
    expect(runsOn.shouldFinish()).toBe(false);
    expect(runsOn.summary()?.protectionTripCount).toBe(1);
    const ends = session({ stopWhen: 'after-recovery', afterRecoverySeconds: 10, protectionEndsTest: true });
    feed(ends);
    expect(ends.shouldFinish()).toBe(true);
    expect(ends.summary()?.capacityEndedBy).toBe('protection');
  });
});

describe('RunSession across restarts', () => {
  const frameAt = (i: number) => ({ t: i, volts: 13.2 - i * 0.002, amps: 5 + (i % 7) * 0.1, clock: 'device' as const });
  /** Resumes the way RunRecorder.resume does: the snapshot stored with the last batch, through JSON. */
  const restart = (s: RunSession): RunSession => {
    const stored = s.takeBatch().patch.pipelineState!;
    const run = { ...s.run };
    return new RunSession(run, null, measureConfigFor(run, null), JSON.parse(stored), [...s.events]);
  };

  it.each([1, 2, 3, 7])('ends with the same totals and events after %i restarts as a run never restarted', (restarts) => {
    const frames = 700;
    const straight = session();
    for (let i = 0; i < frames; i++) straight.push(frameAt(i));
    let resumed = session();
    const every = Math.floor(frames / (restarts + 1));
    let lastDischargeWh = 0;
    for (let i = 0; i < frames; i++) {
      if (i > 0 && i % every === 0 && i / every <= restarts) resumed = restart(resumed);
      resumed.push(frameAt(i));
      // Totals never go back over the run.
      const wh = resumed.pipeline.totals().dischargeWh;
      expect(wh).toBeGreaterThanOrEqual(lastDischargeWh);
      lastDischargeWh = wh;
    }
    expect(resumed.pipeline.totals()).toEqual(straight.pipeline.totals());
    expect(resumed.readingsCount).toBe(frames);
    expect(resumed.events.filter((e) => e.type === 'gap')).toEqual([]);
    expect(resumed.events).toEqual(straight.events);
    expect(resumed.summary()).toEqual(straight.summary());
  });

  it('a trip that reconnects with the load off (the discharge did not go on) ends an after-recovery run, capacity to the trip', () => {
    const s = session({ stopWhen: 'after-recovery', afterRecoverySeconds: 10 });
    for (let t = 0; t <= 300; t++) {
      const open = t > 100 && t <= 160;
      // Under load to t = 100, the protection opens (0.05 V), then it reconnects with no load: 12.4 V at 0 A.
      s.push({ t, volts: open ? 0.05 : t <= 100 ? 12 : 12.4, amps: t <= 100 ? 5 : 0, clock: 'device' });
    }
    expect(s.shouldFinish()).toBe(true);
    expect(s.summary()).toMatchObject({ capacityEndedBy: 'protection', protectionTripCount: 1 });
    expect(s.summary()!.capacityAh!).toBeCloseTo((5 * 100) / 3600, 2);
  });
});

describe('a run-session snapshot stored before the vocabulary renames', () => {
  it('resumes with the same source-clock state from the old field names (offsetS, lastArrivalS, suspectArrivalS)', () => { // vocab-rename: keep
    const run = baseRun({ state: 'recording' });
    const before = new RunSession(run, null, measureConfigFor(run, null));
    for (let i = 0; i < 5; i++) before.clock.accept({ t: 1000 + i, volts: 12, amps: 2, clock: 'device' }, 1_700_000_000 + i);
    const snapshot = before.snapshot();
    expect(snapshot.clock!.lastArrivalSeconds).toBe(1_700_000_004);
    const old = JSON.parse(
      JSON.stringify(snapshot)
        .replace('"offsetSeconds"', '"offsetS"') // vocab-rename: keep
        .replace('"lastArrivalSeconds"', '"lastArrivalS"') // vocab-rename: keep
        .replace('"suspectArrivalSeconds"', '"suspectArrivalS"'), // vocab-rename: keep
    );
    const resumed = new RunSession(run, null, measureConfigFor(run, null), old);
    expect(resumed.clock.state).toEqual(before.clock.state);
  });

  it('resumes with the last run time from the old field name (lastElapsed)', () => { // vocab-rename: keep
    const run = baseRun({ state: 'recording' });
    const before = new RunSession(run, null, measureConfigFor(run, null));
    for (let i = 0; i < 5; i++) before.push({ t: 1000 + i, volts: 12, amps: 2, clock: 'device' });
    const snapshot = before.snapshot();
    expect(snapshot.lastElapsedSeconds).toBe(4);
    const old = JSON.parse(JSON.stringify(snapshot).replace('"lastElapsedSeconds"', '"lastElapsed"')); // vocab-rename: keep
    const resumed = new RunSession(run, null, measureConfigFor(run, null), old);
    expect(resumed.lastElapsedSeconds).toBe(4);
    expect(resumed.snapshot().lastElapsedSeconds).toBe(4);
  });
});
