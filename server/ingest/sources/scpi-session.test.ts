import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { SerialSourceConfigSchema } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { ManualClock } from '../testing/manual-clock.js';
import { mockBinding, settle } from '../testing/mock-ports.js';
import { respondingPortFactory } from '../testing/responder.js';
import { SerialSource } from './serial-source.js';

const PATH = '/dev/ttySCPI';
const POLL_MS = 1000;
const REPLY_TIMEOUT_MS = 300;
const config = SerialSourceConfigSchema.parse({
  kind: 'serial',
  path: PATH,
  format: {
    kind: 'scpi',
    pollMs: POLL_MS,
    replyTimeoutMs: REPLY_TIMEOUT_MS,
    queries: { temps: { cell: 'MEAS:TEMP?' } },
    currentSign: 'discharge-negative',
  },
});

describe('SCPI polling over a serial source', () => {
  beforeEach(() => mockBinding.createPort(PATH, { echo: false, record: true }));
  afterEach(() => mockBinding.reset());

  it('identifies the instrument, polls volts/amps/temperature and builds frames', async () => {
    const clock = new ManualClock();
    const written: string[] = [];
    let silentOnCurrent = false;
    const replies: Record<string, string> = {
      '*IDN?': 'Kestrel Energy,KL-1,0,1.0',
      'MEAS:VOLT?': '+1.32100E+01',
      'MEAS:CURR?': '-5.000 A',
      'MEAS:TEMP?': '24.5',
    };
    const factory = respondingPortFactory((data) => {
      const query = data.toString().trim();
      written.push(query);
      if (silentOnCurrent && query === 'MEAS:CURR?') return undefined;
      return `${replies[query] ?? ''}\r\n`;
    });
    const frames: Frame[] = [];
    const source = new SerialSource(config, { frame: (f) => frames.push(f), status: () => undefined }, { clock, openPort: factory });
    source.start();
    await settle(30);
    expect(written).toEqual(['*IDN?', 'MEAS:VOLT?', 'MEAS:CURR?', 'MEAS:TEMP?']);
    expect(source.getStatus().message).toBe('instrument: Kestrel Energy,KL-1,0,1.0');
    // The meter reads charge-positive, so -5 A on its display is a 5 A discharge here.
    expect(frames).toEqual([{ t: clock.nowMs() / 1000, volts: 13.21, amps: 5, temps: { cell: 24.5 }, clock: 'arrival' }]);

    silentOnCurrent = true;
    clock.advance(POLL_MS);
    await settle(30);
    clock.advance(REPLY_TIMEOUT_MS);
    await settle(30);
    expect(source.getStatus()).toMatchObject({
      framesOk: 1,
      framesRejected: 1,
      lastRejection: `no reply to MEAS:CURR? within ${REPLY_TIMEOUT_MS} ms`,
    });

    silentOnCurrent = false;
    // The next cycle is due one poll period after the previous one began.
    clock.advance(POLL_MS - REPLY_TIMEOUT_MS);
    await settle(30);
    expect(frames).toHaveLength(2);
    await source.stop();
    expect(clock.pendingCount()).toBe(0);
  });

  it('counts a non-numeric reply as a rejection naming the query', async () => {
    const clock = new ManualClock();
    const factory = respondingPortFactory((data) => (data.toString().startsWith('MEAS:VOLT?') ? 'OVLD\n' : '1\n'));
    const source = new SerialSource(config, { frame: () => undefined, status: () => undefined }, { clock, openPort: factory });
    source.start();
    await settle(30);
    expect(source.getStatus()).toMatchObject({ framesOk: 0, framesRejected: 1, lastRejection: "MEAS:VOLT?: 'OVLD' is not a number" });
    await source.stop();
  });
});
