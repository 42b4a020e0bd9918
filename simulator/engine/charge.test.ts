import { describe, expect, it } from 'vitest';
import { loadScenario } from '../scenario/registry.js';
import type { Scenario } from '../scenario/schema.js';
import { createSimulation } from './simulation.js';

const weak = loadScenario('lfp-12v-weak-cell');
/** A 4S LFP pack at 60 % on a 50 A CC-CV charger at 3.6 V a cell (14.4 V, common practice), ending at 5 A. */
const chargeOf = (cells: Scenario['pack']['cells'], cvVolts: number): Scenario => ({
  ...weak,
  pack: { ...weak.pack, initialSoc: 0.6, cells },
  program: [{ kind: 'charge', charger: { cvVolts, ccAmps: 50, termAmps: 5 }, maxSeconds: 4 * 3600, stopWhen: 'charged' }],
});

describe('charging with CC then CV', () => {
  it('a balanced pack charges at the current limit, then tapers in CV to the termination current', () => {
    const sim = createSimulation(chargeOf([], 14.4), { seed: 1, meter: { voltsNoise: 0, ampsNoise: 0 } });
    const frames = [...sim.frames()];
    const end = sim.bench.events.find((e) => e.kind === 'step-end');
    expect(end?.reason).toBe('charged');
    expect(sim.bench.events.some((e) => e.kind === 'bms-trip')).toBe(false);
    expect(frames[1].amps).toBeCloseTo(-50, 2);
    expect(Math.max(...frames.map((f) => f.volts))).toBeLessThanOrEqual(14.4 + 0.001);
    for (const cell of sim.bench.pack.cells) expect(cell.soc).toBeGreaterThan(0.97);
  });

  it('an imbalanced pack: the weak cell overshoots and the per-cell over-voltage cutoff opens on it', () => {
    // Charging a series string to 3.65 V a cell average drives the fullest cell far above 3.65 V.
    const sim = createSimulation(chargeOf(weak.pack.cells, 14.6), { seed: 1 });
    const frames = [...sim.frames()];
    expect(frames.length).toBeGreaterThan(0);
    const trip = sim.bench.events.find((e) => e.kind === 'bms-trip');
    expect(trip?.protection).toBe('over-voltage');
    expect(trip?.cell).toBe(weak.pack.cells[0].index);
    expect(sim.bench.pack.cells[2].soc).toBeGreaterThan(sim.bench.pack.cells[0].soc);
  });
});
