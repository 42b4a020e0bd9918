import { describe, expect, it } from 'vitest';
import { RegisterSpecSchema } from '../../../shared/schemas/bench.js';
import { decodeRegister, planReads } from './modbus-registers.js';

const spec = (input: Record<string, unknown>) => RegisterSpecSchema.parse(input);

describe('decodeRegister', () => {
  it('decodes u16 and i16 (two\'s complement) with scale and offset', () => {
    // 0xFFFF is -1 as a 16-bit two's complement integer; 13210 × 0.001 = 13.21.
    expect(decodeRegister([13210], 0, spec({ address: 0, scale: 0.001 }))).toBeCloseTo(13.21, 12);
    expect(decodeRegister([0, 0xffff], 0, spec({ address: 1, type: 'i16' }))).toBe(-1);
    expect(decodeRegister([0xfc18], 0, spec({ address: 0, type: 'i16', scale: 0.01 }))).toBeCloseTo(-10, 12);
    expect(decodeRegister([2731], 0, spec({ address: 0, scale: 0.1, offset: -273.15 }))).toBeCloseTo(-0.05, 9);
  });

  it('decodes 32-bit integers in both word orders', () => {
    // 0x0001_86A0 = 100000; 0xFFFF_FFFE = -2 as i32.
    expect(decodeRegister([0x0001, 0x86a0], 0, spec({ address: 0, type: 'u32' }))).toBe(100000);
    expect(decodeRegister([0x86a0, 0x0001], 0, spec({ address: 0, type: 'u32', wordOrder: 'low-first' }))).toBe(100000);
    expect(decodeRegister([0xffff, 0xfffe], 0, spec({ address: 0, type: 'i32' }))).toBe(-2);
  });

  it('decodes IEEE 754 single-precision floats', () => {
    // 0x41480000 = 12.5 and 0xC0200000 = -2.5 in IEEE 754 binary32.
    expect(decodeRegister([0x4148, 0x0000], 0, spec({ address: 0, type: 'f32' }))).toBe(12.5);
    expect(decodeRegister([9, 0xc020, 0x0000], 100, spec({ address: 101, type: 'f32' }))).toBe(-2.5);
  });

  it('returns undefined when the reply is too short for the register', () => {
    expect(decodeRegister([1], 0, spec({ address: 0, type: 'u32' }))).toBeUndefined();
    expect(decodeRegister([1, 2], 10, spec({ address: 5 }))).toBeUndefined();
  });
});

describe('planReads', () => {
  it('merges nearby registers into one read and splits beyond 125 registers', () => {
    // 125 registers per function-03 read: Modbus Application Protocol Spec V1.1b3, 6.3.
    expect(planReads([spec({ address: 2 }), spec({ address: 0, type: 'f32' }), spec({ address: 4, type: 'i32' })])).toEqual([
      { start: 0, count: 6 },
    ]);
    expect(planReads([spec({ address: 0 }), spec({ address: 124 }), spec({ address: 125 })])).toEqual([
      { start: 0, count: 125 },
      { start: 125, count: 1 },
    ]);
  });
});
