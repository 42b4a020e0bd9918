import type { z } from 'zod';
import type { Frame } from '../../shared/schemas/frame.js';
import { isPlugged, measure } from '../meter/measure.js';
import { createPrng } from '../prng.js';
import { MeterSchema, ScenarioSchema, type MeterConfig, type Scenario, type ScenarioInput } from '../scenario/schema.js';
import { createBench, type Bench } from './bench.js';
import { systemClock, type Clock } from './clock.js';
import type { ExternalDrive } from './external-drive.js';
import { playReadings, type Player } from './play.js';

export const DEFAULT_SEED = 1;
/** Keeps 1 s / 0.25 s at 4 steps, not 5, when the division lands a hair above an integer. */
const STEP_COUNT_EPSILON = 1e-9;

export interface SimulationOptions {
  /** Same seed, same physics spread and the same meter noise, hence the same bytes. */
  seed?: number;
  /** Simulated seconds per real second when played in real time (60 = a minute a second). */
  speed?: number;
  clock?: Clock;
  /** Overrides of the scenario's meter settings (an ideal meter for checks, say). */
  meter?: Partial<z.input<typeof MeterSchema>>;
  /** Instruments commanded from outside (load, supply) that drive the pack during rest steps. */
  drive?: ExternalDrive;
}

/** One reading of the meter: what it measured, whether it reached the wire, and the truth behind it. */
export interface SimReading {
  seq: number;
  t: number;
  frame: Frame;
  /** Set when the reading never leaves the meter (dropped, or the cable is out). */
  lost?: 'dropped' | 'unplugged';
  /** The bytes of this reading get damaged on the wire (encoders garble them). */
  corrupt: boolean;
  plugged: boolean;
}

export interface Simulation {
  readonly scenario: Scenario;
  readonly meter: MeterConfig;
  readonly seed: number;
  readonly bench: Bench;
  readonly done: boolean;
  /** The next reading (the first is at t = 0), or undefined once the program has ended. */
  step(): SimReading | undefined;
  /** Every frame that reaches the wire intact, to the end of the program. */
  frames(): Generator<Frame>;
  /** Plays the readings in real time at the chosen speed; resolves when done or stopped. */
  play(onReading: (reading: SimReading) => void): Player;
}

/** Creates a seeded simulation of a scenario (validated with zod), stepped by the caller or played. */
export function createSimulation(input: Scenario | ScenarioInput, options: SimulationOptions = {}): Simulation {
  const scenario = ScenarioSchema.parse(input);
  const meter = MeterSchema.parse({ ...scenario.meter, ...options.meter });
  const seed = options.seed ?? DEFAULT_SEED;
  const bench = createBench(scenario, createPrng(seed, 'physics'), options.drive);
  const meterPrng = createPrng(seed, 'meter');
  const hasHeater = scenario.pack.heater !== undefined;
  const substeps = Math.max(1, Math.ceil(meter.readingPeriodSeconds / scenario.maxPhysicsStepSeconds - STEP_COUNT_EPSILON));
  const dtSeconds = meter.readingPeriodSeconds / substeps;
  let seq = 0;
  let wasPlugged = true;

  const nextReading = (): SimReading => {
    const t = Number((seq * meter.readingPeriodSeconds).toFixed(6));
    const p = bench.point();
    const truth = {
      t, volts: p.volts, amps: p.amps, cellTempCelsius: bench.tempCelsius, ambientCelsius: bench.ambientCelsius,
      ...(hasHeater ? { heaterAmps: p.heaterAmps } : {}),
    };
    const frame = measure(truth, seq, meter, meterPrng);
    const dropped = meterPrng.next() < meter.dropProbability;
    const corrupt = meterPrng.next() < meter.corruptProbability;
    const plugged = isPlugged(meter, t);
    if (plugged !== wasPlugged) bench.events.push({ t, kind: plugged ? 'replug' : 'unplug' });
    wasPlugged = plugged;
    const lost = !plugged ? 'unplugged' : dropped ? 'dropped' : undefined;
    seq += 1;
    return { seq: seq - 1, t, frame, corrupt: corrupt && !lost, plugged, ...(lost ? { lost } : {}) };
  };

  const simulation: Simulation = {
    scenario, meter, seed, bench,
    get done() {
      return seq > 0 && bench.done;
    },
    step() {
      if (seq === 0) return nextReading();
      if (bench.done) return undefined;
      for (let i = 0; i < substeps; i += 1) bench.advance(dtSeconds);
      return nextReading();
    },
    *frames() {
      for (let s = simulation.step(); s; s = simulation.step()) if (!s.lost && !s.corrupt) yield s.frame;
    },
    play(onReading) {
      return playReadings(simulation, meter.readingPeriodSeconds, options.speed ?? 1, options.clock ?? systemClock, onReading);
    },
  };
  return simulation;
}
