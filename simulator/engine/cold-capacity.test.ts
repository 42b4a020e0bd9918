import { describe, expect, it } from 'vitest';
import { loadScenario } from '../scenario/registry.js';
import type { Scenario } from '../scenario/schema.js';
import { createSimulation } from './simulation.js';

const base = loadScenario('lfp-12v-weak-cell');
const at = (tempCelsius: number): Scenario => ({
  ...base,
  pack: { ...base.pack, cells: [], initialTempCelsius: tempCelsius },
  ambient: [{ atSeconds: 0, tempCelsius }],
  program: [{ kind: 'discharge', load: { mode: 'cp', watts: 600 }, maxSeconds: 4 * 3600, stopWhen: 'bms-trip' }],
});

function run(scenario: Scenario) {
  const sim = createSimulation(scenario, { seed: 1 });
  const frames = [...sim.frames()];
  return { sim, frames };
}

describe('load and temperature on a whole pack', () => {
  it('a constant-power load draws its set power until the cutoff', () => {
    const { frames } = run(at(25));
    const loaded = frames.filter((f) => f.amps > 1);
    const watts = loaded.map((f) => f.volts * f.amps);
    // Meter noise of 2 mV and 20 mA at ~13 V / 46 A is well under 0.5 % of 600 W.
    for (const w of watts.slice(0, -1)) expect(Math.abs(w - 600)).toBeLessThan(6);
    // The current rises as the voltage sags (I = P / V).
    expect(loaded.at(-2)!.amps).toBeGreaterThan(loaded[0].amps);
  });

  it('a cold pack delivers less energy before cutoff than a warm one (capacity falls when cold)', () => {
    const warm = run(at(25)).sim.bench.totals.dischargedWh;
    const cold = run(at(-10)).sim.bench.totals.dischargedWh;
    // LFP datasheets quote roughly 70-80 % at −10 °C (from memory); the pack's own I²R heat
    // warms it during the test, so it gives somewhat more than a cell held at −10 °C.
    expect(cold / warm).toBeLessThan(0.95);
    expect(cold / warm).toBeGreaterThan(0.7);
  });
});
