import { execFile, spawn } from 'node:child_process';
import { promisify } from 'node:util';
import { afterEach, describe, expect, it } from 'vitest';
import { SerialSourceConfigSchema } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { SIM_INSTRUMENT_REGISTERS, SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../shared/schemas/instrument-presets.js';
import { SIM_LOAD_SPEC, startSimulatedBench, type SimulatedBench } from '../../simulator/index.js';
import { benchControlLfp12v } from '../../simulator/scenarios/bench-control-lfp-12v.js';
import { SerialSource } from '../ingest/sources/serial-source.js';
import { InstrumentFault, type CommandLogEntry, type InstrumentControl } from './instrument-control.js';
import { openInstrument } from './open-instrument.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

const run = promisify(execFile);
const TIMEOUT_MS = 30_000;
/** A simulated minute a second: the pack moves visibly while the test waits a few seconds. */
const SPEED = 60;
const link = (name: string) => `/tmp/kneepoint-ctl-test-${process.pid}-${name}`;
let bench: SimulatedBench | undefined;
const closers: (() => Promise<void>)[] = [];

afterEach(async () => {
  for (const close of closers.splice(0)) await close();
  await bench?.stop();
  bench = undefined;
});

async function until(check: () => boolean, what: string, timeoutMs = TIMEOUT_MS / 3): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

async function start(protocol: 'scpi' | 'modbus' = 'scpi'): Promise<SimulatedBench> {
  bench = await startSimulatedBench({
    protocol,
    scenario: benchControlLfp12v,
    format: 'scpi',
    linkPath: link('meter'),
    loadLinkPath: link('load'),
    supplyLinkPath: link('supply'),
    speed: SPEED,
  });
  return bench;
}

async function open(role: 'load' | 'supply'): Promise<InstrumentControl> {
  const instrument = await openInstrument({
    protocol: 'scpi',
    id: role,
    role,
    port: { path: link(role) },
    commands: role === 'load' ? SIM_LOAD_SCPI : SIM_SUPPLY_SCPI,
    replyTimeoutMs: 300,
  });
  closers.push(() => instrument.close());
  return instrument;
}

/** The meter polled by the server's own SCPI source, as a bench would be. */
function watchMeter(): Frame[] {
  const frames: Frame[] = [];
  const config = SerialSourceConfigSchema.parse({ kind: 'serial', path: link('meter'), format: { kind: 'scpi', pollMs: 100 } });
  const source = new SerialSource(config, { frame: (f) => frames.push(f), status: () => undefined });
  source.start();
  closers.push(() => source.stop());
  return frames;
}

describe('SCPI driver and the simulated load and supply over socat pseudo-terminals', { timeout: TIMEOUT_MS }, () => {
  it('CC 10 A on the load discharges the simulated pack: the meter reads it and the truth adds up', async () => {
    const sim = await start();
    const load = await open('load');
    const log: CommandLogEntry[] = [];
    load.onCommand((e) => log.push(e));
    const frames = watchMeter();
    expect(await load.identify()).toBe(SIM_LOAD_SPEC.idn);
    await load.reset();
    await load.set({ mode: 'cc', value: 10 });
    await load.setOutput(true);
    await until(() => frames.filter((f) => f.amps === 10).length >= 10, 'ten meter frames at 10 A');
    const back = await load.read();
    expect(back.outputOn).toBe(true);
    expect(back.amps).toBe(10);
    expect(back.volts).toBeGreaterThan(12);
    await load.setOutput(false);
    const onSegment = sim.load.segments.find((s) => s.outputOn && s.mode === 'cc' && s.value === 10)!;
    // Charge is current × time (the ampere-hour's definition), over the simulated seconds the input was on.
    expect(onSegment.ah).toBeCloseTo((10 * (onSegment.toS - onSegment.fromS)) / SECONDS_PER_HOUR, 6);
    expect(onSegment.ah).toBeGreaterThan(0);
    expect(await load.errors()).toEqual([]);
    expect(log.filter((e) => e.problem !== null)).toEqual([]);
    expect(log.map((e) => e.sent)).toContain('CURR 10');
  });

  it('the supply charges the pack in CV with a current limit', async () => {
    const sim = await start();
    const supply = await open('supply');
    const frames = watchMeter();
    await supply.set({ mode: 'cv', value: 14.2, currentLimitAmps: 8 });
    await supply.setOutput(true);
    await until(() => frames.filter((f) => f.amps === -8).length >= 5, 'meter frames at 8 A of charge');
    await supply.setOutput(false);
    expect(sim.supply.totals.ah).toBeGreaterThan(0);
  });

  it('server gone: the armed watchdog in the simulated load switches it off', async () => {
    const sim = await start();
    const load = await open('load');
    await load.set({ mode: 'cc', value: 5 });
    await load.setOutput(true);
    expect(await load.armWatchdog(1)).toBe(true);
    // The server stops talking (its process killed): the port closes and nothing more arrives.
    await load.close();
    await until(() => !sim.load.outputOn, 'the load to switch off', 3000);
    expect(sim.load.events.at(-1)?.kind).toBe('watchdog-off');
  });

  it('server process killed: the load stays on while it talks, and its watchdog switches it off after the kill', async () => {
    const sim = await start();
    const WATCHDOG_S = 1;
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/control/testing/hold-load.ts', link('load'), String(WATCHDOG_S)], { stdio: ['ignore', 'pipe', 'inherit'] });
    const exited = new Promise((done) => child.once('exit', done));
    closers.push(async () => {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
      await exited;
    });
    let out = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    await until(() => out.includes('armed'), 'the child to arm the watchdog', TIMEOUT_MS / 2);
    expect(sim.load.outputOn).toBe(true);
    // Alive and polling for three watchdog periods: the load stays on.
    await new Promise((r) => setTimeout(r, 3 * WATCHDOG_S * 1000));
    expect(sim.load.outputOn).toBe(true);
    const killedAtMs = Date.now();
    child.kill('SIGKILL');
    await exited;
    await until(() => !sim.load.outputOn, 'the watchdog to switch the load off', 3000);
    expect(Date.now() - killedAtMs).toBeLessThan(2 * WATCHDOG_S * 1000);
    expect(sim.load.events.at(-1)?.kind).toBe('watchdog-off');
  });

  it('an instrument answering garbage or nothing rejects with InstrumentFault and the reason', async () => {
    const sim = await start();
    const load = await open('load');
    sim.load.fault = 'garbage';
    const garbage = await load.read().catch((e: unknown) => e);
    expect(garbage).toBeInstanceOf(InstrumentFault);
    expect((garbage as InstrumentFault).reason).toMatch(/^MEAS:VOLT\?: garbage reply: garbage '\\x15\\xfe#\?\\x07\\xa9'$/);
    sim.load.fault = 'silent';
    await expect(load.setOutput(false)).rejects.toThrow('SYST:ERR?: no reply within 300 ms');
  });

  it('an independent SCPI peer (pyvisa-py) drives the simulated load the same way', async () => {
    const sim = await start();
    // Debian's python3-pyvisa-py, through /usr/bin/python3 (MACHINE-FACTS: the shim on PATH lacks it).
    const script = [
      'import pyvisa, time, json',
      `r = pyvisa.ResourceManager('@py').open_resource('ASRL${link('load')}::INSTR', read_termination='\\n', write_termination='\\n', timeout=2000)`,
      "idn = r.query('*IDN?')",
      "r.write('FUNC CURR'); r.write('CURR 7.5'); r.write('INP ON')",
      'time.sleep(0.5)',
      "print(json.dumps({'idn': idn, 'state': r.query('INP?'), 'amps': r.query('MEAS:CURR?'), 'err': r.query('SYST:ERR?')}))",
      'r.close()',
    ].join('\n');
    const { stdout } = await run('/usr/bin/python3', ['-c', script], { timeout: TIMEOUT_MS / 3 });
    const answer = JSON.parse(stdout) as Record<string, string>;
    expect(answer).toEqual({ idn: SIM_LOAD_SPEC.idn, state: '1', amps: '7.5000', err: '0,"No error"' });
    expect(sim.load.values.cc).toBe(7.5);
  });
});

describe('Modbus RTU driver and the simulated load over a socat pseudo-terminal', { timeout: TIMEOUT_MS }, () => {
  it('CC 10 A through the register map discharges the pack; the meter reads it', async () => {
    const sim = await start('modbus');
    const load = await openInstrument({ protocol: 'modbus', id: 'load', role: 'load', port: { path: link('load') }, registers: SIM_INSTRUMENT_REGISTERS });
    closers.push(() => load.close());
    const frames = watchMeter();
    expect(await load.identify()).toBe(SIM_LOAD_SPEC.idn);
    await load.reset();
    await load.set({ mode: 'cc', value: 10 });
    await load.setOutput(true);
    await until(() => frames.filter((f) => f.amps === 10).length >= 5, 'meter frames at 10 A');
    expect(await load.read()).toMatchObject({ amps: 10, outputOn: true });
    expect(await load.armWatchdog(1)).toBe(true);
    await load.close();
    await until(() => !sim.load.outputOn, 'the watchdog to switch the load off', 3000);
    expect(sim.load.totals.ah).toBeGreaterThan(0);
  });

  it('an independent Modbus master (mbpoll) reads and writes the same registers', async () => {
    const sim = await start('modbus');
    // Debian's mbpoll: RTU at 115200 8N1, unit 1, holding registers (-t 4), 0-based addresses (-0), once (-1).
    const mbpoll = (...args: string[]) =>
      run('mbpoll', ['-m', 'rtu', '-a', '1', '-b', '115200', '-P', 'none', '-t', '4', '-0', '-1', '-o', '2', link('load'), ...args].filter(Boolean), { timeout: TIMEOUT_MS / 3 });
    // Mode register 0 = 0 (CC), set current at 2–3 (u32 mA) = 4000, output at 12 = 1.
    await mbpoll('-r', '0', '--', '0');
    await mbpoll('-r', '2', '--', '0', '4000');
    await mbpoll('-r', '12', '--', '1');
    expect([sim.load.mode, sim.load.values.cc, sim.load.outputOn]).toEqual(['cc', 4, true]);
    await until(() => sim.load.amps === 4, 'the load to sink 4 A');
    const { stdout } = await mbpoll('-r', '18', '-c', '2');
    const words = [...stdout.matchAll(/\[(\d+)\]:\s+(-?\d+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
    // Amps at 18–19: i32 mA, high word first: 4000 mA = words 0, 4000.
    expect(words).toEqual([[18, 0], [19, 4000]]);
  });
});
