import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { SerialSourceConfigSchema } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { ManualClock } from '../testing/manual-clock.js';
import { mockBinding, settle } from '../testing/mock-ports.js';
import { respondingPortFactory } from '../testing/responder.js';
import { SerialSource } from './serial-source.js';

const PATH = '/dev/ttyMB';
const UNIT_ID = 7;
const POLL_MS = 500;

/** CRC-16/MODBUS (poly 0xA001 reflected, init 0xFFFF): Modbus over Serial Line V1.02, 6.2.2. */
function crc16(bytes: Buffer): number {
  let crc = 0xffff;
  for (const byte of bytes) {
    crc ^= byte;
    for (let bit = 0; bit < 8; bit++) crc = crc & 1 ? (crc >> 1) ^ 0xa001 : crc >> 1;
  }
  return crc;
}

function withCrc(body: number[]): Buffer {
  const buf = Buffer.from(body);
  const crc = crc16(buf);
  // The CRC goes low byte first (Modbus over Serial Line V1.02, 2.5.1.2).
  return Buffer.concat([buf, Buffer.from([crc & 0xff, crc >> 8])]);
}

const config = SerialSourceConfigSchema.parse({
  kind: 'serial',
  path: PATH,
  baudRate: 19200,
  format: {
    kind: 'modbus',
    unitId: UNIT_ID,
    pollMs: POLL_MS,
    registers: {
      volts: { address: 0, type: 'u16', scale: 0.01 },
      amps: { address: 1, type: 'i16', scale: 0.01 },
      temps: { cell: { address: 2, type: 'i16', scale: 0.1 } },
      aux: { heaterAmps: { address: 4, type: 'f32' } },
    },
  },
});

describe('Modbus RTU polling over a serial source', () => {
  beforeEach(() => mockBinding.createPort(PATH, { echo: false, record: true }));
  afterEach(() => mockBinding.reset());

  it('our CRC matches the widely quoted request 01 03 00 00 00 0A C5 CD', () => {
    // Read 10 holding registers from unit 1: a common worked example (from memory).
    expect(withCrc([1, 3, 0, 0, 0, 10]).subarray(-2)).toEqual(Buffer.from([0xc5, 0xcd]));
  });

  it('reads the register block, decodes scaled values and counts exceptions and bad CRCs', async () => {
    const clock = new ManualClock();
    const requests: Buffer[] = [];
    let mode: 'ok' | 'exception' | 'bad-crc' = 'ok';
    // Registers: 13.21 V (1321), -2.5 A (0xFF06 = -250), -5.5 °C (0xFFC9 = -55), pad, 1.5 A heater as f32 0x3FC00000.
    const words = [1321, 0xff06, 0xffc9, 0, 0x3fc0, 0x0000];
    const factory = respondingPortFactory((req) => {
      requests.push(req);
      if (mode === 'exception') return withCrc([UNIT_ID, 0x83, 0x02]);
      const body = [UNIT_ID, 3, words.length * 2, ...words.flatMap((w) => [w >> 8, w & 0xff])];
      const reply = withCrc(body);
      if (mode === 'bad-crc') reply[reply.length - 1]! ^= 0xff;
      // Deliver in two pieces, as a serial line would: the adapter must join them.
      return [reply.subarray(0, 4), reply.subarray(4)];
    });
    const frames: Frame[] = [];
    const source = new SerialSource(config, { frame: (f) => frames.push(f), status: () => undefined }, { clock, openPort: factory });
    source.start();
    await settle(40);
    expect(requests[0]).toEqual(withCrc([UNIT_ID, 3, 0, 0, 0, 6]));
    expect(frames).toHaveLength(1);
    const frame = frames[0]!;
    expect(frame.volts).toBeCloseTo(13.21, 12);
    expect(frame.amps).toBeCloseTo(-2.5, 12);
    expect(frame.temps?.cell).toBeCloseTo(-5.5, 12);
    expect(frame.aux).toEqual({ heaterAmps: 1.5 });

    mode = 'exception';
    clock.advance(POLL_MS);
    await settle(40);
    expect(source.getStatus().framesRejected).toBe(1);
    expect(source.getStatus().lastRejection).toMatch(/^modbus: .*(Illegal data address|exception)/i);

    mode = 'bad-crc';
    clock.advance(POLL_MS);
    await settle(40);
    expect(source.getStatus().framesRejected).toBe(2);
    expect(source.getStatus().lastRejection).toMatch(/crc/i);

    mode = 'ok';
    clock.advance(POLL_MS);
    await settle(40);
    expect(frames).toHaveLength(2);
    await source.stop();
  });
});

describe('decodeModbusFrame', () => {
  it('takes the device time and sequence from registers when mapped', async () => {
    const { decodeModbusFrame } = await import('./modbus-session.js');
    const format = config.format.kind === 'modbus' ? config.format : undefined;
    const withTime = {
      ...format!,
      registers: {
        volts: { address: 0, type: 'i32' as const, scale: 0.001, offset: 0, wordOrder: 'high-first' as const },
        amps: { address: 2, type: 'i32' as const, scale: 0.001, offset: 0, wordOrder: 'high-first' as const },
        seq: { address: 8, type: 'u32' as const, scale: 1, offset: 0, wordOrder: 'high-first' as const },
        t: { address: 10, type: 'u32' as const, scale: 0.1, offset: 0, wordOrder: 'high-first' as const },
        temps: {},
        aux: {},
      },
    };
    // -2500 as a 32-bit two's complement is 0xFFFF_F63C.
    const words = [0, 13210, 0xffff, 0xf63c, 0, 0, 0, 0, 0, 77, 0, 1234];
    const frame = decodeModbusFrame(withTime, [{ block: { start: 0, count: 12 }, words }], 5_000);
    expect(frame).toMatchObject({ volts: 13.21, amps: -2.5, seq: 77, clock: 'device' });
    expect(typeof frame !== 'string' && frame.t).toBeCloseTo(123.4, 9);
    const short = decodeModbusFrame(withTime, [{ block: { start: 0, count: 4 }, words: words.slice(0, 4) }], 5_000);
    expect(short).toBe('register 10 (t) missing from reply');
  });
});

describe('decodeModbusFrame with f32 NaN and infinity', () => {
  // IEEE 754 single precision: 0x7FC00000 is a quiet NaN, 0x7F800000 is +∞, 0x41A00000 is 20.0.
  const f32 = (address: number) => ({ address, type: 'f32' as const, scale: 1, offset: 0, wordOrder: 'high-first' as const });
  const format = {
    ...(config.format.kind === 'modbus' ? config.format : ({} as never)),
    registers: { volts: f32(0), amps: f32(2), temps: { cell: f32(4), ambient: f32(6) }, aux: {} },
  };
  const block = (words: number[]) => [{ block: { start: 0, count: words.length }, words }];

  it('rejects a frame whose volts or amps read NaN or infinity, naming the register', async () => {
    const { decodeModbusFrame } = await import('./modbus-session.js');
    expect(decodeModbusFrame(format, block([0x7fc0, 0, 0x41a0, 0, 0x41a0, 0, 0x41a0, 0]), 0)).toBe('register 0 (volts) reads NaN');
    expect(decodeModbusFrame(format, block([0x41a0, 0, 0x7f80, 0, 0x41a0, 0, 0x41a0, 0]), 0)).toBe('register 2 (amps) reads Infinity');
  });

  it('leaves out a temperature probe that reads NaN and keeps the rest of the frame', async () => {
    const { decodeModbusFrame } = await import('./modbus-session.js');
    const frame = decodeModbusFrame(format, block([0x41a0, 0, 0x41a0, 0, 0x7fc0, 0, 0x41a0, 0]), 0);
    expect(frame).toMatchObject({ volts: 20, amps: 20, temps: { ambient: 20 } });
    expect(typeof frame !== 'string' && frame.temps).not.toHaveProperty('cell');
  });
});
