/**
 * Simulator figures: how fast the physics runs (simulated seconds per real second) and how
 * fast each encoder turns readings into bytes. Prints and returns; asserts nothing.
 */
import { performance } from 'node:perf_hooks';
import { createMeterDevice } from '../simulator/meter/device.js';
import { createSimulation, type SimReading } from '../simulator/engine/simulation.js';
import { loadScenario } from '../simulator/scenario/registry.js';
import { withCrc } from '../simulator/encoders/modbus/crc16.js';

const SCENARIO = 'lfp-12v-100ah-cp-cutoff';
const MODBUS_READ_12 = withCrc(Uint8Array.of(1, 3, 0, 0, 0, 12));
const SCPI_FETCH = new TextEncoder().encode('FETC?\n');

/** Runs the simulator benchmark. */
export async function run(): Promise<Record<string, string | number>> {
  const scenario = loadScenario(SCENARIO);
  const started = performance.now();
  const sim = createSimulation(scenario, { seed: 1 });
  const readings: SimReading[] = [];
  for (let s = sim.step(); s; s = sim.step()) readings.push(s);
  const physicsMs = performance.now() - started;
  const figures: Record<string, string | number> = {
    scenario: SCENARIO,
    readings: readings.length,
    physicsMs: Math.round(physicsMs),
    simulatedSecondsPerRealSecond: Math.round(readings.at(-1)!.t / (physicsMs / 1000)),
  };
  for (const format of ['csv', 'jsonl', 'scpi', 'modbus'] as const) {
    const device = createMeterDevice({ format, meter: sim.meter, seed: 1 });
    let bytes = 0;
    const t0 = performance.now();
    for (const s of readings) {
      for (const chunk of device.sample(s)) bytes += chunk.length;
      if (format === 'scpi') for (const r of device.receive(SCPI_FETCH)) bytes += r.length;
      if (format === 'modbus') for (const r of device.receive(MODBUS_READ_12)) bytes += r.length;
    }
    const ms = performance.now() - t0;
    figures[`${format}SamplesPerS`] = Math.round(readings.length / (ms / 1000));
    figures[`${format}Bytes`] = bytes;
  }
  for (const [key, value] of Object.entries(figures)) console.log(`${key}: ${value}`);
  return figures;
}
