import { describe, expect, it } from 'vitest';
import { hasValidCrc, withCrc } from '../encoders/modbus/crc16.js';
import { createSimulation, type SimReading } from '../engine/simulation.js';
import { loadScenario } from '../scenario/registry.js';
import { createMeterDevice, csvOptionsFor, type MeterFormat } from './device.js';

const scenario = loadScenario('noisy-meter-unplug');
const READ = withCrc(Uint8Array.of(1, 3, 0, 0, 0, 12));
const FETCH = new TextEncoder().encode('FETC?\n');
const decoder = new TextDecoder();

function readingsOf(seed: number): SimReading[] {
  const sim = createSimulation(scenario, { seed });
  const out: SimReading[] = [];
  for (let s = sim.step(); s; s = sim.step()) out.push(s);
  return out;
}

/** Every byte a meter puts on the wire for a run, with one query per reading for query meters. */
function wireBytes(format: MeterFormat, seed: number, readings: SimReading[]): Uint8Array[] {
  const sim = createSimulation(scenario, { seed });
  const device = createMeterDevice({ format, meter: sim.meter, seed, csv: csvOptionsFor(sim.scenario) });
  const out: Uint8Array[] = [];
  for (const s of readings) {
    out.push(...device.sample(s));
    if (!s.plugged) continue;
    if (format === 'scpi') out.push(...device.receive(FETCH));
    if (format === 'modbus') out.push(...device.receive(READ));
  }
  return out;
}

describe('meter devices on the wire', () => {
  const readings = readingsOf(21);

  it.each(['csv', 'jsonl', 'scpi', 'modbus'] as const)('%s: the same seed gives the same bytes, another seed others', (format) => {
    const a = wireBytes(format, 21, readings);
    expect(wireBytes(format, 21, readingsOf(21))).toEqual(a);
    expect(wireBytes(format, 22, readingsOf(22))).not.toEqual(a);
  });

  it('streaming meters: lost readings are missing lines, garbled ones differ, the header returns after a replug', () => {
    const lines = wireBytes('csv', 21, readings).map((b) => decoder.decode(b));
    const headers = lines.filter((l) => l.startsWith('t_s,'));
    expect(headers).toHaveLength(2);
    const delivered = readings.filter((s) => s.plugged && !s.lost);
    expect(lines.length - headers.length).toBe(delivered.length);
    const wellFormed = /^-?\d+\.\d,-?\d+\.\d{3},-?\d+\.\d{3},-?\d+\.\d\r\n$/;
    const bad = lines.filter((l) => !l.startsWith('t_s,') && !wellFormed.test(l));
    const corrupt = delivered.filter((s) => s.corrupt).length;
    expect(corrupt).toBeGreaterThan(0);
    // A cut-short line may still look well formed, so at most as many bad lines as damaged ones.
    expect(bad.length).toBeGreaterThan(0);
    expect(bad.length).toBeLessThanOrEqual(corrupt);
  });

  it('query meters: some replies never come and some fail their CRC, at the configured rates', () => {
    const replies = wireBytes('modbus', 21, readings);
    const queries = readings.filter((s) => s.plugged).length;
    const missing = 1 - replies.length / queries;
    const badCrc = replies.filter((r) => !hasValidCrc(r)).length / queries;
    expect(missing).toBeGreaterThan(scenario.meter.dropProbability / 3);
    expect(missing).toBeLessThan(scenario.meter.dropProbability * 3);
    expect(badCrc).toBeGreaterThan(0);
    expect(badCrc).toBeLessThan(scenario.meter.corruptProbability * 3);
  });
});
