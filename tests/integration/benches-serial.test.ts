import { afterEach, describe, expect, it } from 'vitest';
import { SerialSourceConfigSchema, SimulatorSourceConfigSchema, type BenchStatus, type SerialFormat } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { createSource } from '../../server/ingest/sources/create-source.js';
import { SerialSource, STALE_PERIODS_BEFORE_REOPEN } from '../../server/ingest/sources/serial-source.js';
import { loadScenario, startPtyMeter, type PtyMeter } from '../../simulator/index.js';

/**
 * The real serial path end to end: the simulator writes a meter's bytes into a socat
 * pseudo-terminal (linked under /tmp, never inside the repository), and the serial source
 * opens the other end with serialport. Each format must deliver every sample in order, and
 * survive an unplug and replug by reconnecting on its own.
 */

const SCENARIO = loadScenario('lfp-12v-100ah-cp-cutoff');
const POLL_MS = 30;
/**
 * A short no-data watchdog, so that an unplug whose hang-up serialport does not report (about
 * 1 in 30 here, simulator/README.md) is recovered by the watchdog's reopen well within WAIT_MS.
 */
const STALE_AFTER_S = 2;
/** The latest an unplug leads to `reconnecting`: stale after STALE_AFTER_S, reopened after further periods. */
const WATCHDOG_REOPEN_MS = STALE_AFTER_S * 1000 * (1 + STALE_PERIODS_BEFORE_REOPEN);
const WAIT_MS = 15_000;
/** CSV carries t to 0.1 s and volts/amps to 1 mV/mA (the simulator's default columns); Modbus scales by 0.001. */
const VALUE_TOLERANCE = 0.0015;

const FORMATS: Record<'csv' | 'jsonl' | 'scpi' | 'modbus', unknown> = {
  csv: { kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'] },
  jsonl: { kind: 'jsonl' },
  scpi: {
    kind: 'scpi',
    pollMs: POLL_MS,
    replyTimeoutMs: 1000,
    queries: { temps: { cell: 'MEAS:TEMP?', ambient: 'MEAS:TEMP? (@2)' } },
  },
  // The simulator's default holding-register map (simulator/encoders/modbus/register-map.ts).
  modbus: {
    kind: 'modbus',
    unitId: 1,
    pollMs: POLL_MS,
    replyTimeoutMs: 1000,
    registers: {
      volts: { address: 0, type: 'i32', scale: 0.001 },
      amps: { address: 2, type: 'i32', scale: 0.001 },
      seq: { address: 8, type: 'u32' },
      t: { address: 10, type: 'u32', scale: 0.1 },
      temps: { cell: { address: 4, type: 'i16', scale: 0.1 }, ambient: { address: 5, type: 'i16', scale: 0.1 } },
    },
  },
};

let cleanup: Array<() => Promise<void>> = [];
afterEach(async () => {
  for (const step of cleanup.reverse()) await step().catch(() => undefined);
  cleanup = [];
});

async function setUp(format: keyof typeof FORMATS) {
  const linkPath = `/tmp/kneepoint-ingest-${process.pid}-${format}`;
  const meter: PtyMeter = await startPtyMeter({ scenario: SCENARIO, format, linkPath, autoplay: false, seed: 5 });
  cleanup.push(() => meter.stop());
  const config = SerialSourceConfigSchema.parse({ kind: 'serial', path: linkPath, baudRate: 115200, staleAfterSeconds: STALE_AFTER_S, format: FORMATS[format] });
  const frames: Frame[] = [];
  const states: BenchStatus['state'][] = [];
  const source = new SerialSource(config, { frame: (f) => frames.push(f), status: (s) => states.push(s.state) });
  cleanup.push(() => source.stop());
  source.start();
  // A polled meter answers at once (a Modbus slave reads zeros before its first sample), so it may already be receiving.
  await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toMatch(/^(connected|receiving)$/);
  return { meter, source, frames, states, format: config.format as SerialFormat };
}

/** Ticks `count` samples; streaming meters push each, so we only collect what went on the wire. */
async function tickStreaming(meter: PtyMeter, count: number): Promise<Frame[]> {
  const sent: Frame[] = [];
  for (let i = 0; i < count; i++) {
    const sample = await meter.tick();
    if (sample && !sample.lost && !sample.corrupt) sent.push(sample.frame);
  }
  return sent;
}

/** Ticks one sample at a time and waits until the poller has read it back. */
async function tickPolled(meter: PtyMeter, frames: Frame[], count: number, matches: (a: Frame, b: Frame) => boolean) {
  const sent: Frame[] = [];
  for (let i = 0; i < count; i++) {
    const sample = await meter.tick();
    if (!sample || sample.lost || sample.corrupt) continue;
    sent.push(sample.frame);
    await expect.poll(() => frames.length > 0 && matches(frames[frames.length - 1]!, sample.frame), { timeout: WAIT_MS }).toBe(true);
  }
  return sent;
}

function expectSameFrames(received: Frame[], sent: Frame[], withTime: boolean) {
  expect(received).toHaveLength(sent.length);
  received.forEach((frame, i) => {
    if (withTime) expect(frame.t).toBeCloseTo(sent[i]!.t, 1);
    expect(Math.abs(frame.volts - sent[i]!.volts)).toBeLessThan(VALUE_TOLERANCE);
    expect(Math.abs(frame.amps - sent[i]!.amps)).toBeLessThan(VALUE_TOLERANCE);
  });
}

/**
 * Unplugs and replugs. Whether serialport reports the hang-up (reconnecting at once) or not
 * (stale, then the watchdog closes and reopens the port), the source ends up reconnecting.
 */
async function unplugAndReplug(meter: PtyMeter, source: SerialSource) {
  expect(WATCHDOG_REOPEN_MS).toBeLessThan(WAIT_MS / 2);
  await meter.unplug();
  await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toBe('reconnecting');
  await meter.replug();
  await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toMatch(/^(connected|receiving)$/);
}

describe('serial source over a pseudo-terminal', () => {
  for (const format of ['csv', 'jsonl'] as const) {
    it(`${format}: receives every frame in order and reconnects after an unplug`, async () => {
      const { meter, source, frames, states } = await setUp(format);
      const before = await tickStreaming(meter, 40);
      await expect.poll(() => frames.length, { timeout: WAIT_MS }).toBe(before.length);
      expectSameFrames(frames, before, true);
      expect(frames.every((f) => f.clock === 'device')).toBe(true);

      await unplugAndReplug(meter, source);
      const after = await tickStreaming(meter, 20);
      await expect.poll(() => frames.length, { timeout: WAIT_MS }).toBe(before.length + after.length);
      expectSameFrames(frames, [...before, ...after], true);
      expect(states).toEqual(expect.arrayContaining(['connected', 'receiving', 'reconnecting']));
      expect(source.getStatus().framesRejected).toBe(0); // the CSV header is skipped, not rejected
    });
  }

  it('csv: a port that goes silent is closed and reopened by the watchdog, then receives again', async () => {
    // The path of an unplug whose hang-up is never reported: the port stays open but nothing arrives.
    const { meter, source, frames, states } = await setUp('csv');
    const before = await tickStreaming(meter, 5);
    await expect.poll(() => frames.length, { timeout: WAIT_MS }).toBe(before.length);
    await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toBe('stale');
    await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toBe('reconnecting');
    expect(source.getStatus().message).toMatch(/reopening the port/);
    await expect.poll(() => source.getStatus().state, { timeout: WAIT_MS }).toBe('connected');
    const after = await tickStreaming(meter, 5);
    await expect.poll(() => frames.length, { timeout: WAIT_MS }).toBe(before.length + after.length);
    expectSameFrames(frames, [...before, ...after], true);
    expect(states.indexOf('reconnecting')).toBeGreaterThan(states.indexOf('stale'));
  });

  it('scpi: polls every sample in order and reconnects after an unplug', async () => {
    const { meter, source, frames } = await setUp('scpi');
    const same = (a: Frame, b: Frame) =>
      Math.abs(a.volts - b.volts) < VALUE_TOLERANCE && Math.abs(a.amps - b.amps) < VALUE_TOLERANCE && a.temps?.cell === b.temps?.cell;
    const before = await tickPolled(meter, frames, 8, same);
    await unplugAndReplug(meter, source);
    const after = await tickPolled(meter, frames, 4, same);
    // Each polled frame is one of the samples, and they appear in the order the meter took them.
    const sent = [...before, ...after];
    const seen = frames.map((f) => sent.findIndex((s) => same(f, s))).filter((i) => i >= 0);
    const distinct = seen.filter((i, k) => k === 0 || i !== seen[k - 1]);
    expect(distinct).toEqual(sent.map((_s, i) => i));
    expect(frames.at(-1)!.temps?.ambient).toBeCloseTo(sent.at(-1)!.temps!.ambient!, 6);
  });

  it('modbus: polls every sample in order (device time from registers) and reconnects after an unplug', async () => {
    const { meter, source, frames } = await setUp('modbus');
    const same = (a: Frame, b: Frame) => Math.abs(a.t - b.t) < 0.05 && Math.abs(a.volts - b.volts) < VALUE_TOLERANCE;
    const before = await tickPolled(meter, frames, 8, same);
    await unplugAndReplug(meter, source);
    const after = await tickPolled(meter, frames, 4, same);
    const sent = [...before, ...after];
    const ts = frames.filter((f) => sent.some((s) => same(f, s))).map((f) => f.t);
    const distinct = ts.filter((t, k) => k === 0 || t !== ts[k - 1]);
    expect(distinct.map((t) => Math.round(t * 10))).toEqual(sent.map((s) => Math.round(s.t * 10)));
    expect(frames.every((f) => f.clock === 'device')).toBe(true);
    expect(frames.at(-1)!.seq).toBe(sent.at(-1)!.seq);
  });
});

describe('simulator bench through a pseudo-terminal', () => {
  for (const format of ['csv', 'modbus'] as const) {
    it(`${format}: a simulator source with a format streams the scenario over the real serial path`, async () => {
      const frames: Frame[] = [];
      const config = SimulatorSourceConfigSchema.parse({ kind: 'simulator', scenario: 'lfp-48v-30ah-pwm-heater', speed: 50, seed: 2, format });
      const source = createSource(config, { frame: (f) => frames.push(f), status: () => undefined });
      cleanup.push(() => source.stop());
      source.start();
      await expect.poll(() => frames.length, { timeout: WAIT_MS }).toBeGreaterThan(20);
      await source.stop();
      // The heated pack's meter reports the heater current (a CSV column derived from the scenario, a Modbus register).
      expect(frames.at(-1)!.aux).toHaveProperty('heaterAmps');
      expect(frames.at(-1)!.temps).toHaveProperty('cell');
      expect(frames.every((f) => f.clock === 'device')).toBe(true);
      const ts = frames.map((f) => f.t);
      expect(ts.every((t, i) => i === 0 || t >= ts[i - 1]!)).toBe(true);
      expect(source.getStatus().state).toBe('idle');
    });
  }
});
