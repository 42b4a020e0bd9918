import { describe, expect, it } from 'vitest';
import { integrateReadings } from '../../shared/measure/integrator.js';
import { createSimulation } from '../engine/simulation.js';
import { benchControlLfp12v } from '../scenarios/bench-control-lfp-12v.js';
import { instrumentsDrive } from './drive.js';
import { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from './instrument-specs.js';
import { createScpiControl, GARBAGE_REPLY } from './scpi-control.js';
import { SimInstrument } from './sim-instrument.js';
import { TestClock } from './test-clock.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';


function bench() {
  const clock = new TestClock();
  const load = new SimInstrument(SIM_LOAD_SPEC, clock);
  const supply = new SimInstrument(SIM_SUPPLY_SPEC, clock);
  const sim = createSimulation(benchControlLfp12v, { drive: instrumentsDrive([load, supply]) });
  const loadScpi = createScpiControl(load);
  const supplyScpi = createScpiControl(supply);
  const steps = (n: number) => Array.from({ length: n }, () => sim.step()!);
  return { clock, load, supply, sim, loadScpi, supplyScpi, steps };
}

describe('simulated load and supply on the simulated pack', () => {
  it('CC 10 A on the load discharges the pack; the meter and the load agree with the pack', () => {
    const { load, sim, loadScpi, steps } = bench();
    const idle = steps(5);
    expect(idle.every((s) => s.frame.amps === 0)).toBe(true);
    expect(loadScpi.receive('FUNC CURR\nCURR 10\nINP ON\n')).toEqual([]);
    // Each step advances the physics one sample period, then samples: 10 A from the first one.
    const loaded = steps(360);
    expect(loaded.every((s) => s.frame.amps === 10)).toBe(true);
    expect(loaded.at(-1)!.frame.volts).toBeLessThan(idle.at(-1)!.frame.volts);
    // 10 A for 360 s is 1 Ah by the definition of the ampere-hour.
    expect(load.totals.ah).toBeCloseTo((10 * 360) / SECONDS_PER_HOUR, 6);
    expect(load.totals.ah).toBeCloseTo(sim.bench.totals.netAh, 9);
    expect(load.totals.wh).toBeCloseTo(sim.bench.totals.dischargedWh, 9);
    // The meter's frames, integrated by the trapezoidal rule, give the same charge.
    expect(integrateReadings(loaded.map((s) => s.frame)).dischargeAh).toBeCloseTo(load.totals.ah, 2);
    expect(loadScpi.receive('MEAS:CURR?\nINP?\n')).toEqual(['10.0000\n', '1\n']);
    expect(Number(loadScpi.receive('MEAS:VOLT?\n')[0])).toBeCloseTo(loaded.at(-1)!.frame.volts, 2);
    expect(load.segments.map((s) => [s.mode, s.value, s.outputOn])).toEqual([['cc', 0, false], ['cc', 10, true]]);
    expect(load.segments[1].ah).toBeCloseTo(load.totals.ah, 12);
  });

  it('the supply charges CC-CV: the current limit first, then less as the voltage reaches the set point', () => {
    const { supply, sim, supplyScpi, steps } = bench();
    supplyScpi.receive('FUNC VOLT;VOLT 14.2;CURR 5\nOUTP ON\n');
    const charging = steps(60);
    expect(charging.at(-1)!.frame.amps).toBe(-5);
    expect(supply.totals.ah).toBeGreaterThan(0);
    expect(supply.totals.ah).toBeCloseTo(-sim.bench.totals.netAh, 9);
    // Half of 20 Ah at 5 A is two hours; by 2.5 h the current has tapered at 14.2 V.
    const tapering = steps(9000);
    const last = tapering.at(-1)!.frame;
    expect(last.amps).toBeGreaterThan(-1);
    expect(last.amps).toBeLessThan(0);
    expect(last.volts).toBeCloseTo(14.2, 1);
    expect(supply.segments.at(-1)!.ah).toBeGreaterThan(9);
  });

  it('the armed watchdog switches the load off when no command comes in time', () => {
    const { clock, load, loadScpi, steps } = bench();
    loadScpi.receive('FUNC CURR;CURR 10;INP ON;SYST:WDOG 5\n');
    clock.advance(4000);
    loadScpi.receive('MEAS:CURR?\n');
    clock.advance(4000);
    expect(load.outputOn).toBe(true);
    steps(3);
    clock.advance(1000);
    expect(load.outputOn).toBe(false);
    expect(load.events.map((e) => [e.kind, e.atMs])).toEqual([['output-on', 0], ['watchdog-off', 9000]]);
    expect(steps(3).at(-1)!.frame.amps).toBe(0);
  });

  it('refuses what the instrument cannot do, into its error queue', () => {
    const { supplyScpi, loadScpi, supply } = bench();
    supplyScpi.receive('FUNC POW\nVOLT 500\nCURR abc\nBOGUS 1\n');
    expect(supplyScpi.receive('SYST:ERR?\nSYST:ERR?\nSYST:ERR?\nSYST:ERR?\nSYST:ERR?\n')).toEqual([
      '-221,"Settings conflict"\n',
      '-222,"Data out of range"\n',
      '-104,"Data type error"\n',
      '-113,"Undefined header"\n',
      '0,"No error"\n',
    ]);
    expect(supply.mode).toBe('cc');
    expect(loadScpi.receive('*IDN?\n')).toEqual([`${SIM_LOAD_SPEC.idn}\n`]);
  });

  it('a broken instrument answers noise or nothing and does not obey', () => {
    const { load, loadScpi } = bench();
    load.fault = 'garbage';
    expect(loadScpi.receive('INP ON\n*IDN?\n')).toEqual([GARBAGE_REPLY, GARBAGE_REPLY]);
    load.fault = 'silent';
    expect(loadScpi.receive('INP ON\n*IDN?\n')).toEqual([]);
    expect(load.outputOn).toBe(false);
  });

  it('*RST switches off, returns to CC and disarms the watchdog', () => {
    const { load, loadScpi } = bench();
    loadScpi.receive('FUNC POW;POW 100;INP ON;SYST:WDOG 3\n*RST\n');
    expect([load.outputOn, load.mode, load.values.cp, load.watchdogS]).toEqual([false, 'cc', 0, 0]);
  });
});
