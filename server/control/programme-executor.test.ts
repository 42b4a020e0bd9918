import { describe, expect, it } from 'vitest';
import { planSteps } from '../../shared/measure/programme-plan.js';
import type { ProgrammeStep } from '../../shared/schemas/programme.js';
import type { ProgrammeStepEvent } from '../../shared/schemas/run-event.js';
import { ManualClock } from '../ingest/testing/manual-clock.js';
import type { CommandLogEntry } from './instrument-control.js';
import { ProgrammeExecutor, WATCHDOG_SECONDS } from './programme-executor.js';
import { METER_SILENT_MS, type SafetyLimits } from './safety-net.js';
import { FakeBench, type FakePackSpec } from './testing/fake-bench.js';
import { FakeInstrument } from './testing/fake-instrument.js';

// A made-up pack (demo values): 24 V empty to 28 V full, 10 Ah, 20 mΩ, half charged.
const PACK: FakePackSpec = { emptyVolts: 24, fullVolts: 28, capacityAh: 10, resistanceOhms: 0.02, startSoc: 0.5, tempCelsius: 25 };
const LIMITS: SafetyLimits = { floorVolts: 20, ceilingVolts: 29.2, overTempCelsius: 60, meterSilentMs: METER_SILENT_MS };
const READING_MS = 1000;
const HOUR_S = 3600;

const CHARGE: ProgrammeStep = { kind: 'charge', volts: 28, currentAmps: 5, taperAmps: 0.5 };
const REST_60: ProgrammeStep = { kind: 'rest', maxSeconds: 60 };
const DISCHARGE: ProgrammeStep = { kind: 'discharge', mode: 'cc', value: 5, endVolts: 24.5 };
const REST_SETTLE: ProgrammeStep = { kind: 'rest', settleVoltsPerMinute: 0.001, maxSeconds: 600 };

/** Lets the executor's queued instrument commands run (the fakes answer at once). */
const settle = () => new Promise<void>((resolve) => setImmediate(resolve));

function rig(steps: ProgrammeStep[], opts: { pack?: Partial<FakePackSpec>; loadWatchdog?: boolean } = {}) {
  const clock = new ManualClock();
  const load = new FakeInstrument('load-1', 'load', () => clock.nowMs(), opts.loadWatchdog ?? true);
  const supply = new FakeInstrument('supply-1', 'supply', () => clock.nowMs(), false);
  const bench = new FakeBench({ ...PACK, ...opts.pack }, load, supply);
  const events: ProgrammeStepEvent[] = [];
  const commands: CommandLogEntry[] = [];
  const executor = new ProgrammeExecutor({
    plan: planSteps(steps), instruments: { load, supply }, clock, limits: LIMITS,
    onStepEvent: (e) => events.push(e), onChange: () => undefined, onCommand: (c) => commands.push(c),
  });
  /** One meter reading every second, with the clock moved on to match. */
  const run = async (seconds: number, feed = true) => {
    for (let s = 0; s < seconds && !['finished', 'failed', 'aborted'].includes(executor.view().state); s++) {
      clock.advance(READING_MS);
      if (feed) executor.onReading(bench.step(READING_MS / 1000));
      await settle();
    }
  };
  return { clock, load, supply, bench, events, commands, executor, run };
}

describe('programme executor: charge, rest, discharge, rest on a fake bench', () => {
  it('runs the steps in order and gives each one its charge in and discharge out', async () => {
    const r = rig([CHARGE, REST_60, DISCHARGE, REST_SETTLE]);
    await r.executor.start();
    await r.run(6 * HOUR_S);
    const view = r.executor.view();
    expect(view.state).toBe('finished');
    expect(view.results.map((x) => [x.kind, x.cause])).toEqual([['charge', 'taper'], ['rest', 'time'], ['discharge', 'end-voltage'], ['rest', 'settled']]);
    const [charge, rest, discharge, lastRest] = view.results;
    // Check values: the model's own Coulomb count (1 Ah = 3600 C, the definition of the
    // ampere-hour, SI Brochure 9th ed. table 8); the run's trapezoid totals must agree within 0.5 %.
    expect(charge!.chargeAh).toBeCloseTo(r.bench.truthChargeAh, 1);
    expect(Math.abs(charge!.chargeAh - r.bench.truthChargeAh) / r.bench.truthChargeAh).toBeLessThan(0.005);
    expect(Math.abs(discharge!.dischargeAh - r.bench.truthDischargeAh) / r.bench.truthDischargeAh).toBeLessThan(0.005);
    // A 5 A constant-current discharge: Ah = A × h over the step's own duration.
    expect(discharge!.dischargeAh).toBeCloseTo((5 * (discharge!.endElapsedSeconds - discharge!.startElapsedSeconds)) / HOUR_S, 2);
    // At rest nothing flows; the only Ah is the trapezoid's share of the panel across the switch-off (under one reading's worth).
    expect(rest!.chargeAh + rest!.dischargeAh).toBeLessThan((0.5 * 1) / HOUR_S);
    expect(rest!.endElapsedSeconds - rest!.startElapsedSeconds).toBeGreaterThanOrEqual(59);
    // Settled: at rest the model's voltage is flat, so one window (60 s) after the step began.
    expect(lastRest!.endElapsedSeconds - lastRest!.startElapsedSeconds).toBeLessThan(70);
    expect(discharge!.endVolts).toBeLessThanOrEqual(24.5);
    expect(r.load.outputOn).toBe(false);
    expect(r.supply.outputOn).toBe(false);
    expect(r.events.filter((e) => e.phase === 'start').map((e) => e.label)).toEqual(['1 charge', '2 rest', '3 discharge', '4 rest']);
    expect(r.events.filter((e) => e.phase === 'end')).toHaveLength(4);
  });

  it('never has the charger and the load on together, and sets each before switching it on', async () => {
    const r = rig([CHARGE, DISCHARGE, CHARGE], { pack: { startSoc: 0.3 } });
    await r.executor.start();
    let together = 0;
    for (let s = 0; s < 8 * HOUR_S && r.executor.view().state === 'running'; s++) {
      r.clock.advance(READING_MS);
      r.executor.onReading(r.bench.step(1));
      await settle();
      if (r.load.outputOn && r.supply.outputOn) together++;
    }
    expect(together).toBe(0);
    expect(r.load.calls.indexOf('set cc 5')).toBeLessThan(r.load.calls.indexOf('output on'));
    expect(r.supply.calls).toContain('set cv 28 limit 5');
    // Full, empty, full again: a round trip below 100 % (the model's 20 mΩ loses energy both ways).
    const [trip] = r.executor.roundTrips();
    expect(trip).toMatchObject({ dischargeIndex: 1, chargeIndex: 2 });
    expect(trip!.energyEfficiency).toBeGreaterThan(0.9);
    expect(trip!.energyEfficiency).toBeLessThan(1);
  });

  it('ends a discharge at its target Ah before the end voltage', async () => {
    const r = rig([{ ...DISCHARGE, targetAh: 1 }], { pack: { startSoc: 0.9 } });
    await r.executor.start();
    await r.run(2 * HOUR_S);
    const [result] = r.executor.view().results;
    expect(result).toMatchObject({ cause: 'target', outcome: 'done' });
    // 1 Ah at 5 A is 720 s; readings come every second, so it ends within one reading's charge.
    expect(result!.dischargeAh).toBeGreaterThanOrEqual(1);
    expect(result!.dischargeAh).toBeLessThan(1 + 5 / HOUR_S + 1e-9);
  });

  it('arms the watchdog of every instrument that has one and logs every command', async () => {
    const r = rig([REST_60]);
    await r.executor.start();
    expect(r.executor.view().watchdogArmed).toEqual(['load-1']);
    expect(r.load.watchdogSeconds).toBe(WATCHDOG_SECONDS);
    expect(r.commands.some((c) => c.instrumentId === 'load-1' && c.sent === `watchdog ${WATCHDOG_SECONDS}`)).toBe(true);
  });
});

describe('programme executor: the safety net', () => {
  async function discharging() {
    const r = rig([DISCHARGE]);
    await r.executor.start();
    await r.run(30);
    expect(r.load.outputOn).toBe(true);
    return r;
  }

  it('switches the load off within 2 s when the meter goes silent', async () => {
    const r = await discharging();
    const lastReadingMs = r.clock.nowMs();
    let offAfterMs: number | null = null;
    for (let ms = 0; ms <= 5000 && offAfterMs === null; ms += 50) {
      r.clock.advance(50);
      await settle();
      if (!r.load.outputOn) offAfterMs = r.clock.nowMs() - lastReadingMs;
    }
    expect(offAfterMs).not.toBeNull();
    expect(offAfterMs!).toBeLessThanOrEqual(2000);
    expect(r.executor.view()).toMatchObject({ state: 'failed' });
    expect(r.executor.view().failReason).toMatch(/meter silent/);
    expect(r.events.at(-1)).toMatchObject({ phase: 'fail', reason: expect.stringMatching(/meter silent/) });
  });

  it('fails safe when the load answers garbage, naming the reason', async () => {
    const r = await discharging();
    r.load.behaviour = 'garbage';
    await r.run(3);
    expect(r.load.outputOn).toBe(false);
    expect(r.executor.view().state).toBe('failed');
    expect(r.executor.view().failReason).toMatch(/load-1: garbage reply to read\?/);
    expect(r.executor.view().results.at(-1)).toMatchObject({ outcome: 'failed', cause: 'fault' });
    expect(r.commands.some((c) => c.problem?.startsWith('garbage reply'))).toBe(true);
  });

  it('fails safe when the load stops answering; its own watchdog then turns it off', async () => {
    const r = await discharging();
    r.load.behaviour = 'silent';
    await r.run(3);
    expect(r.executor.view().state).toBe('failed');
    expect(r.executor.view().failReason).toMatch(/load-1: no reply/);
    // The off command never reached it; the instrument's watchdog does, once nothing has come for its timeout.
    r.clock.advance(WATCHDOG_SECONDS * 1000);
    r.bench.step(1);
    expect(r.load.outputOn).toBe(false);
  });

  it('fails safe when the instrument reports an error after a set point', async () => {
    const r = rig([DISCHARGE]);
    r.load.queuedErrors.push('-222,"Data out of range"');
    await r.executor.start();
    await r.run(3);
    expect(r.load.outputOn).toBe(false);
    expect(r.executor.view().failReason).toMatch(/Data out of range/);
  });

  it('switches the load off at the safety floor even when the step would go lower', async () => {
    const r = rig([{ ...DISCHARGE, endVolts: 10 }], { pack: { startSoc: 0.05, emptyVolts: 20.05 } });
    await r.executor.start();
    await r.run(2 * HOUR_S);
    expect(r.load.outputOn).toBe(false);
    expect(r.executor.view().failReason).toMatch(/at or below the safety floor of 20\.000 V/);
  });

  it('switches everything off at the over-temperature limit', async () => {
    const r = await discharging();
    r.bench.tempCelsius = 61;
    await r.run(2);
    expect(r.load.outputOn).toBe(false);
    expect(r.executor.view().failReason).toMatch(/temperature cell at 61\.0 °C/);
  });

  it('fails a wait for temperature that has no temperature to wait for, outputs off', async () => {
    const r = rig([{ kind: 'wait-temp', targetCelsius: 30, direction: 'below', maxSeconds: 5 }]);
    await r.executor.start();
    r.bench.tempCelsius = 40;
    await r.run(10);
    expect(r.executor.view().failReason).toBe('temperature not below 30 °C after 5 s');
  });
});

describe('programme executor: a technician pauses, skips and aborts', () => {
  it('pause switches off and stops the step clock; resume switches back on', async () => {
    const r = rig([DISCHARGE]);
    await r.executor.start();
    await r.run(10);
    r.executor.control('pause');
    await settle();
    expect(r.load.outputOn).toBe(false);
    const startedAt = r.executor.view().stepStartedAtMs!;
    await r.run(20);
    // Paused time is left out of the step's time.
    expect(r.executor.view().stepStartedAtMs! - startedAt).toBe(20_000);
    r.executor.control('resume');
    await settle();
    expect(r.load.outputOn).toBe(true);
    expect(r.events.map((e) => e.phase)).toEqual(['start', 'pause', 'resume']);
  });

  it('skip ends the step as skipped and starts the next', async () => {
    const r = rig([DISCHARGE, REST_60]);
    await r.executor.start();
    await r.run(10);
    r.executor.control('skip');
    await settle();
    expect(r.load.outputOn).toBe(false);
    expect(r.executor.view()).toMatchObject({ currentIndex: 1, state: 'running' });
    expect(r.executor.view().results[0]).toMatchObject({ outcome: 'skipped', cause: 'skipped' });
  });

  it('abort switches everything off and ends the programme', async () => {
    const r = rig([DISCHARGE, REST_60]);
    await r.executor.start();
    await r.run(10);
    r.executor.control('abort');
    expect(await r.executor.done).toBe('aborted');
    // Done means the off commands have been answered: nothing closes the ports before them.
    expect(r.load.outputOn).toBe(false);
    expect(r.events.at(-1)).toMatchObject({ phase: 'abort', reason: 'aborted by a technician' });
  });

  it('done waits until a slow instrument has switched off (the ports may be closed right after)', async () => {
    const r = rig([DISCHARGE]);
    await r.executor.start();
    await r.run(10);
    r.load.slow = true;
    r.executor.control('abort');
    await r.executor.done;
    expect(r.load.outputOn).toBe(false);
  });
});
