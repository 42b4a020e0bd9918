import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { InstrumentDriverInput } from '../../shared/schemas/instrument-driver.js';
import { SIM_INSTRUMENT_REGISTERS } from '../../shared/schemas/instrument-presets.js';
import { SIM_LOAD_SPEC, SimInstrument } from '../../simulator/index.js';
import { createModbusControl } from '../../simulator/instruments/modbus-control.js';
import { TestClock } from '../../simulator/instruments/test-clock.js';
import { systemClock } from '../ingest/clock.js';
import { mockBinding } from '../ingest/testing/mock-ports.js';
import { respondingPortFactory } from '../ingest/testing/responder.js';
import { InstrumentFault, type CommandLogEntry, type InstrumentControl } from './instrument-control.js';
import { openInstrument } from './open-instrument.js';

const PATH = '/dev/ttyMODBUSLOAD';
const REPLY_TIMEOUT_MS = 60;
const config: InstrumentDriverInput = {
  protocol: 'modbus',
  id: 'load-mb',
  role: 'load',
  port: { path: PATH },
  unitId: 1,
  registers: SIM_INSTRUMENT_REGISTERS,
  replyTimeoutMs: REPLY_TIMEOUT_MS,
};

describe('Modbus RTU instrument driver', () => {
  let sim: SimInstrument;
  let instrument: InstrumentControl;
  let log: CommandLogEntry[];
  let mode: 'ok' | 'silent' | 'noise' | 'bad-crc';
  const requests: Buffer[] = [];

  beforeEach(async () => {
    mockBinding.createPort(PATH, { echo: false, record: true });
    sim = new SimInstrument(SIM_LOAD_SPEC, new TestClock());
    const slave = createModbusControl(sim);
    mode = 'ok';
    requests.length = 0;
    const factory = respondingPortFactory((data) => {
      requests.push(data);
      if (mode === 'silent') return undefined;
      if (mode === 'noise') return Buffer.from([0x15, 0xfe, 0x23, 0x3f]);
      const replies = slave.receive(data).map((r) => Buffer.from(r));
      if (mode === 'bad-crc') for (const r of replies) r[r.length - 1] ^= 0xff;
      return replies;
    });
    instrument = await openInstrument(config, { clock: systemClock, openPort: factory });
    log = [];
    instrument.onCommand((e) => log.push(e));
  });
  afterEach(async () => {
    await instrument.close();
    mockBinding.reset();
  });

  it('reads the identity registers as text', async () => {
    expect(await instrument.identify()).toBe(SIM_LOAD_SPEC.idn);
  });

  it('writes mode, value and output with function 16 and reads them back', async () => {
    await instrument.set({ mode: 'cp', value: 120.5 });
    await instrument.setOutput(true);
    expect([sim.mode, sim.values.cp, sim.outputOn]).toEqual(['cp', 120.5, true]);
    // 120.5 W in mW is 120500 = 0x0001_D6B4. Write multiple registers: unit 1, function 0x10, register 4, two registers (Modbus V1.1b3, 6.12).
    expect([...requests.find((r) => r[1] === 0x10 && r[3] === 4)!.subarray(0, 6)]).toEqual([1, 0x10, 0, 4, 0, 2]);
    expect(await instrument.read()).toEqual({ volts: 0, amps: 0, outputOn: true });
    expect(log.find((e) => e.sent.startsWith('write 4'))).toMatchObject({ sent: 'write 4 = 0001 d6b4 (cp value)', reply: 'ok', problem: null });
  });

  it('a write the instrument refuses leaves an error code, and set rejects with it', async () => {
    await expect(instrument.set({ mode: 'cc', value: 61 })).rejects.toThrow('load-mb: refused the last write: error code 2');
    expect(sim.values.cc).toBe(0);
    expect(await instrument.errors()).toEqual([]);
  });

  it('arms the watchdog register and resets through the reset register', async () => {
    expect(await instrument.armWatchdog(4)).toBe(true);
    expect(sim.watchdogS).toBe(4);
    await instrument.setOutput(true);
    await instrument.reset();
    expect([sim.outputOn, sim.watchdogS, sim.events.at(-1)?.kind]).toEqual([false, 0, 'reset']);
  });

  it('silence, noise and a bad CRC each reject with their reason', async () => {
    mode = 'silent';
    await expect(instrument.read()).rejects.toThrow(`read 8 at 12 (read back): no reply within ${REPLY_TIMEOUT_MS} ms`);
    mode = 'noise';
    await expect(instrument.read()).rejects.toThrow('garbage reply: 15fe233f is no Modbus reply');
    mode = 'bad-crc';
    const failure = await instrument.setOutput(true).catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(InstrumentFault);
    expect((failure as InstrumentFault).reason).toMatch(/^write 12 = 0001 \(output on\): garbage reply: .*CRC/i);
    expect(log.at(-1)?.problem).toMatch(/garbage reply/);
  });

  it('an exception reply rejects with the exception', async () => {
    await instrument.close();
    mockBinding.createPort(`${PATH}2`, { echo: false, record: true });
    const slave = createModbusControl(sim);
    instrument = await openInstrument(
      // An error register past the instrument's map: the slave answers exception 02, illegal data address.
      { ...config, port: { path: `${PATH}2` }, registers: { ...SIM_INSTRUMENT_REGISTERS, errorCode: { address: 200, type: 'u16' } } },
      { clock: systemClock, openPort: respondingPortFactory((d) => slave.receive(d).map((r) => Buffer.from(r))) },
    );
    const failure = await instrument.errors().catch((e: unknown) => e);
    expect(failure).toBeInstanceOf(InstrumentFault);
    expect((failure as InstrumentFault).reason).toMatch(/^read 1 at 200 \(error code\): .*[Ee]xception.*2/);
  });

  it('refuses a value that does not fit its register before writing', async () => {
    const before = requests.length;
    await expect(instrument.set({ mode: 'cr', value: 5e9 })).rejects.toThrow('cr value: 5000000000 does not fit a u32 register at 6');
    // The mode register is written first; the value never goes out.
    expect(requests.slice(before).filter((r) => r[3] === 6)).toEqual([]);
  });
});
