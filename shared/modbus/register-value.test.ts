import { describe, expect, it } from 'vitest';
import { decodeRegisterValue, encodeRegisterValue } from './register-value.js';

describe('Modbus register values', () => {
  it('encodes and decodes each type, with scale and word order', () => {
    // 14.2 V in mV as u32: 14200 = 0x0000_3778 (plain hexadecimal arithmetic).
    expect(encodeRegisterValue(14.2, { address: 8, type: 'u32', scale: 0.001 })).toEqual([0x0000, 0x3778]);
    expect(encodeRegisterValue(14.2, { address: 8, type: 'u32', scale: 0.001, wordOrder: 'low-first' })).toEqual([0x3778, 0x0000]);
    // −1 in two's complement is all ones (IEEE/two's-complement convention, common practice).
    expect(encodeRegisterValue(-0.001, { address: 0, type: 'i32', scale: 0.001 })).toEqual([0xffff, 0xffff]);
    expect(encodeRegisterValue(-1, { address: 0, type: 'i16' })).toEqual([0xffff]);
    // 1.5 as IEEE 754 binary32 is 0x3FC00000 (IEEE 754-2008 encoding, from memory).
    expect(encodeRegisterValue(1.5, { address: 0, type: 'f32' })).toEqual([0x3fc0, 0x0000]);
    for (const [value, spec] of [
      [14.2, { address: 0, type: 'u32', scale: 0.001 }],
      [-12.345, { address: 0, type: 'i32', scale: 0.001 }],
      [-3276.8, { address: 0, type: 'i16', scale: 0.1 }],
      [1.5, { address: 0, type: 'f32' }],
      [25, { address: 0, type: 'u16', offset: -40 }],
    ] as const) {
      expect(decodeRegisterValue(encodeRegisterValue(value, spec), spec)).toBeCloseTo(value, 6);
    }
  });

  it('refuses a value that would wrap in its register', () => {
    expect(() => encodeRegisterValue(70, { address: 3, type: 'u16', scale: 0.001 })).toThrow('70 does not fit a u16 register at 3');
    expect(() => encodeRegisterValue(-1, { address: 3, type: 'u32' })).toThrow(RangeError);
    expect(() => encodeRegisterValue(Number.NaN, { address: 3, type: 'u16' })).toThrow(RangeError);
  });
});
