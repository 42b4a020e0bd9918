import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import type { Frame } from '../../../shared/schemas/frame.js';
import { hasValidCrc, modbusCrc16, withCrc } from './crc16.js';
import { DEFAULT_REGISTER_MAP, frameToRegisters, RegisterMapSchema, registersToValue } from './register-map.js';
import { createModbusSlave } from './slave.js';

// modbus-serial's own CRC routine, the one its master uses to accept or reject replies.
const libraryCrc16 = createRequire(import.meta.url)('modbus-serial/utils/crc16') as (b: Buffer) => number;

const frame: Frame = { t: 1234.5, volts: 13.287, amps: -46.123, temps: { cell: -3.9, ambient: 22.5 }, aux: { heaterAmps: 2.4 }, clock: 'device', seq: 2469 };
const readRequest = (unit: number, start: number, count: number, fn = 3) => withCrc(Uint8Array.of(unit, fn, start >> 8, start & 0xff, count >> 8, count & 0xff));

describe('Modbus CRC-16', () => {
  it('matches the CRC catalogue check value and a request from the specification', () => {
    // CRC-16/MODBUS check value for "123456789" is 0x4B37 (Greg Cook's CRC RevEng catalogue).
    expect(modbusCrc16(new TextEncoder().encode('123456789'))).toBe(0x4b37);
    // "01 03 00 00 00 0A C5 CD": read 10 holding registers from unit 1 (widely reproduced example, from memory).
    expect([...withCrc(Uint8Array.of(1, 3, 0, 0, 0, 10))].slice(-2)).toEqual([0xc5, 0xcd]);
  });

  it('agrees with modbus-serial on replies the slave builds', () => {
    const slave = createModbusSlave(7);
    slave.update(frame);
    const [reply] = slave.receive(readRequest(7, 0, 12));
    const body = Buffer.from(reply.subarray(0, -2));
    expect(libraryCrc16(body)).toBe(Buffer.from(reply).readUInt16LE(reply.length - 2));
    expect(hasValidCrc(reply)).toBe(true);
  });
});

describe('register map', () => {
  it('scales, signs and splits 32-bit values high word first, and reads them back', () => {
    const image = frameToRegisters(frame, DEFAULT_REGISTER_MAP);
    // -46.123 A at 1 mA a count = -46123 = 0xFFFF4BD5 in two's complement.
    expect([image[2], image[3]]).toEqual([0xffff, 0x4bd5]);
    const back = Object.fromEntries(DEFAULT_REGISTER_MAP.registers.map((r) => [r.field, registersToValue(image, r, 'high-first')]));
    expect(back.volts).toBeCloseTo(13.287, 9);
    expect(back.amps).toBeCloseTo(-46.123, 9);
    expect(back['temp:cell']).toBeCloseTo(-3.9, 9);
    expect(back['aux:heaterAmps']).toBeCloseTo(2.4, 9);
    expect(back.seq).toBe(2469);
    expect(back.t).toBeCloseTo(1234.5, 9);
  });

  it('supports a custom map with low word first, saturating out-of-range values', () => {
    const map = RegisterMapSchema.parse({ wordOrder: 'low-first', registers: [{ address: 0, field: 'volts', type: 'uint32', scale: 0.0001 }, { address: 2, field: 'amps', type: 'int16', scale: 0.001 }] });
    const image = frameToRegisters(frame, map);
    expect(registersToValue(image, map.registers[0], 'low-first')).toBeCloseTo(13.287, 9);
    expect(image[0]).toBe(132870 % 65536);
    // -46.123 A at 1 mA does not fit an int16: the register saturates at -32768.
    expect(registersToValue(image, map.registers[1], 'low-first')).toBeCloseTo(-32.768, 9);
  });
});

describe('Modbus RTU slave', () => {
  it('answers function 03 and 04, ignores other units and bad CRCs, and resynchronises', () => {
    const slave = createModbusSlave(1);
    slave.update(frame);
    expect(slave.receive(readRequest(2, 0, 2))).toEqual([]);
    const damaged = readRequest(1, 0, 2);
    damaged[3] ^= 0x40;
    expect(slave.receive(damaged)).toEqual([]);
    slave.resetFraming();
    // Noise before a good request: the slave hunts byte by byte for a frame with a valid CRC.
    const [reply] = slave.receive(Uint8Array.of(0x55, 0xaa, ...readRequest(1, 0, 2)));
    expect([...reply.subarray(0, 7)]).toEqual([1, 3, 4, 0, 0, 0x33, 0xe7]);
    expect(slave.receive(readRequest(1, 4, 1, 4))[0][1]).toBe(4);
  });

  it('returns exceptions 01, 02 and 03 as the specification defines them', () => {
    const slave = createModbusSlave(1);
    const write = withCrc(Uint8Array.of(1, 6, 0, 0, 0, 1));
    expect([...slave.receive(write)[0].subarray(0, 3)]).toEqual([1, 0x86, 1]);
    expect([...slave.receive(readRequest(1, 10, 10))[0].subarray(0, 3)]).toEqual([1, 0x83, 2]);
    expect([...slave.receive(readRequest(1, 0, 126))[0].subarray(0, 3)]).toEqual([1, 0x83, 3]);
  });
});
