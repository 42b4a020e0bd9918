import type { SerialPortMock } from 'serialport';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { InstrumentDriverInput } from '../../shared/schemas/instrument-driver.js';
import { SIM_LOAD_SCPI } from '../../shared/schemas/instrument-presets.js';
import { ManualClock } from '../ingest/testing/manual-clock.js';
import { mockBinding, settle } from '../ingest/testing/mock-ports.js';
import { respondingPortFactory } from '../ingest/testing/responder.js';
import { InstrumentFault, type CommandLogEntry, type InstrumentControl } from './instrument-control.js';
import { openInstrument } from './open-instrument.js';

const PATH = '/dev/ttyLOAD';
const REPLY_TIMEOUT_MS = 200;
const config: InstrumentDriverInput = {
  protocol: 'scpi',
  id: 'load-1',
  role: 'load',
  port: { path: PATH },
  commands: SIM_LOAD_SCPI,
  replyTimeoutMs: REPLY_TIMEOUT_MS,
  limits: { cc: 40 },
};

/** A scripted instrument: fixed replies per query, an error queue, and switches to misbehave. */
function scripted() {
  const script = {
    written: [] as string[],
    errorQueue: [] as string[],
    replies: { '*IDN?': 'Ostwind Labs,EL-300,OW1234,2.1', 'MEAS:VOLT?': '13.2051', 'MEAS:CURR?': '10.0000', 'INP?': '1' } as Record<string, string>,
    silent: false,
    garbage: undefined as Buffer | undefined,
    /** Bytes from the instrument that answer nothing just sent (a late reply). */
    late: (text: string) => void made[0]?.port?.emitData(text),
  };
  const made: SerialPortMock[] = [];
  const factory = respondingPortFactory((data) => {
    const line = data.toString().trim();
    script.written.push(line);
    if (script.silent) return undefined;
    if (script.garbage !== undefined) return script.garbage;
    if (line === 'SYST:ERR?') return `${script.errorQueue.shift() ?? '0,"No error"'}\n`;
    const reply = script.replies[line];
    return reply === undefined ? undefined : `${reply}\r\n`;
  }, made);
  return { script, factory };
}

describe('SCPI instrument driver', () => {
  let clock: ManualClock;
  let instrument: InstrumentControl;
  let log: CommandLogEntry[];
  let script: ReturnType<typeof scripted>['script'];

  beforeEach(async () => {
    mockBinding.createPort(PATH, { echo: false, record: true });
    clock = new ManualClock();
    const made = scripted();
    script = made.script;
    instrument = await openInstrument(config, { clock, openPort: made.factory });
    log = [];
    instrument.onCommand((entry) => log.push(entry));
  });
  afterEach(async () => {
    await instrument.close();
    mockBinding.reset();
  });

  it('identifies, sets CC with its value and checks the error queue after each command', async () => {
    expect(await instrument.identify()).toBe('Ostwind Labs,EL-300,OW1234,2.1');
    await instrument.set({ mode: 'cc', value: 10 });
    await instrument.setOutput(true);
    expect(script.written).toEqual(['*IDN?', 'FUNC CURR', 'SYST:ERR?', 'CURR 10', 'SYST:ERR?', 'INP ON', 'SYST:ERR?']);
    expect(log.map((e) => [e.sent, e.reply, e.problem])).toEqual([
      ['*IDN?', 'Ostwind Labs,EL-300,OW1234,2.1', null],
      ['FUNC CURR', null, null],
      ['SYST:ERR?', '0,"No error"', null],
      ['CURR 10', null, null],
      ['SYST:ERR?', '0,"No error"', null],
      ['INP ON', null, null],
      ['SYST:ERR?', '0,"No error"', null],
    ]);
    expect(log.every((e) => e.instrumentId === 'load-1' && e.atMs === clock.nowMs())).toBe(true);
  });

  it('reads back volts, amps and the input state', async () => {
    expect(await instrument.read()).toEqual({ volts: 13.2051, amps: 10, outputOn: true });
  });

  it('rejects a refused command with the instrument error it reported', async () => {
    script.errorQueue.push('-222,"Data out of range"');
    const failure = instrument.set({ mode: 'cp', value: 100 });
    await expect(failure).rejects.toBeInstanceOf(InstrumentFault);
    await expect(failure).rejects.toThrow('load-1: refused FUNC POW: -222,"Data out of range"');
  });

  it('rejects garbage with the reason and logs the exchange', async () => {
    script.garbage = Buffer.from([0x15, 0xfe, 0x23, 0x3f, 0x0a]);
    await expect(instrument.read()).rejects.toThrow(/MEAS:VOLT\?: garbage reply: garbage '\\x15\\xfe#\?'/);
    expect(log.at(-1)).toMatchObject({ sent: 'MEAS:VOLT?', reply: '\u0015\u00fe#?', problem: expect.stringContaining('garbage') });
  });

  it('rejects an identity that is not maker,model,serial,firmware', async () => {
    script.replies['*IDN?'] = '13.2051';
    await expect(instrument.identify()).rejects.toThrow("'13.2051' is not an identity");
  });

  it('rejects a reply of the wrong kind (a number where a state belongs)', async () => {
    script.replies['INP?'] = '13.2';
    await expect(instrument.read()).rejects.toThrow("INP?: garbage reply: '13.2' is not an on/off state");
  });

  it('times out on silence, and a late reply does not answer the next query', async () => {
    script.silent = true;
    const pending = instrument.identify();
    await settle();
    clock.advance(REPLY_TIMEOUT_MS);
    await expect(pending).rejects.toThrow(`load-1: *IDN?: no reply within ${REPLY_TIMEOUT_MS} ms`);
    expect(log.at(-1)).toMatchObject({ sent: '*IDN?', reply: null, problem: `no reply within ${REPLY_TIMEOUT_MS} ms` });
    // A command with no reply is caught by its error-queue check (asked once a late reply could no longer come).
    const setting = instrument.setOutput(false);
    await settle();
    clock.advance(REPLY_TIMEOUT_MS);
    await settle();
    clock.advance(REPLY_TIMEOUT_MS);
    await expect(setting).rejects.toThrow('SYST:ERR?: no reply');
  });

  it('a late reply to a timed-out query is not taken as the answer to the next one', async () => {
    script.silent = true;
    const pending = instrument.read();
    await settle();
    clock.advance(REPLY_TIMEOUT_MS);
    await expect(pending).rejects.toThrow('no reply');
    script.silent = false;
    // The fail-safe command goes out at once; its error-queue check waits out the late reply.
    const off = instrument.setOutput(false);
    await settle();
    expect(script.written.slice(-1)).toEqual(['INP OFF']);
    // The instrument's late answer to MEAS:VOLT? arrives now.
    script.late('13.2051\n');
    await settle();
    clock.advance(REPLY_TIMEOUT_MS);
    await settle();
    await off;
    expect(script.written.slice(-2)).toEqual(['INP OFF', 'SYST:ERR?']);
    expect(log.at(-1)).toMatchObject({ sent: 'SYST:ERR?', reply: '0,"No error"', problem: null });
  });

  it('refuses a set point above the limit or not positive before sending anything', async () => {
    await expect(instrument.set({ mode: 'cc', value: 45 })).rejects.toThrow("CC 45 A is above the instrument's limit of 40 A");
    await expect(instrument.set({ mode: 'cc', value: Number.NaN })).rejects.toThrow('CC value NaN is not a positive number');
    await expect(instrument.set({ mode: 'cv', value: 12, currentLimitAmps: 5 })).rejects.toThrow('has no current limit command');
    expect(script.written).toEqual([]);
  });

  it('drains the error queue until 0', async () => {
    script.errorQueue.push('-113,"Undefined header"', '-221,"Settings conflict"');
    expect(await instrument.errors()).toEqual(['-113,"Undefined header"', '-221,"Settings conflict"']);
    expect(await instrument.errors()).toEqual([]);
  });

  it('arms the watchdog with its command; reset sends *RST and switches the input off', async () => {
    expect(await instrument.armWatchdog(5)).toBe(true);
    await instrument.reset();
    expect(script.written.filter((w) => w !== 'SYST:ERR?')).toEqual(['SYST:WDOG 5', '*RST', 'INP OFF']);
  });

  it('fails every exchange once the port is gone', async () => {
    await instrument.close();
    await expect(instrument.read()).rejects.toThrow('MEAS:VOLT?: instrument closed');
  });
});

describe('SCPI instrument without a watchdog', () => {
  afterEach(() => mockBinding.reset());

  it('says it has none', async () => {
    mockBinding.createPort(PATH, { echo: false, record: true });
    const { factory, script } = scripted();
    const instrument = await openInstrument(
      { ...config, commands: { ...SIM_LOAD_SCPI, watchdog: undefined } },
      { clock: new ManualClock(), openPort: factory },
    );
    expect(await instrument.armWatchdog(5)).toBe(false);
    expect(script.written).toEqual([]);
    await instrument.close();
  });
});
