import type { z } from 'zod';
import type { RegisterSpecSchema } from '../schemas/bench.js';

type RegisterSpec = z.input<typeof RegisterSpecSchema>;

const WORD = 0x10000;
const WORD_MASK = 0xffff;
const RANGE = {
  u16: [0, 0xffff],
  i16: [-0x8000, 0x7fff],
  u32: [0, 0xffffffff],
  i32: [-0x80000000, 0x7fffffff],
} as const;

/** How many 16-bit registers a value of this type takes. */
export function wordsOf(type: RegisterSpec['type']): number {
  return type === 'u16' || type === 'i16' || type === undefined ? 1 : 2;
}

/**
 * The registers that hold `value` (engineering units) under `spec`: raw = (value − offset) / scale,
 * rounded to the register's integer; 32-bit values in the spec's word order. Throws RangeError
 * when the raw value does not fit the register (it would wrap to a different set point).
 */
export function encodeRegisterValue(value: number, spec: RegisterSpec): number[] {
  const type = spec.type ?? 'u16';
  const raw = (value - (spec.offset ?? 0)) / (spec.scale ?? 1);
  let high: number;
  let low: number;
  if (type === 'f32') {
    const view = new DataView(new ArrayBuffer(4));
    view.setFloat32(0, raw);
    [high, low] = [view.getUint16(0), view.getUint16(2)];
  } else {
    const rounded = Math.round(raw);
    const [min, max] = RANGE[type];
    if (!Number.isFinite(rounded) || rounded < min || rounded > max) throw new RangeError(`${value} does not fit a ${type} register at ${spec.address}`);
    if (wordsOf(type) === 1) return [rounded & WORD_MASK];
    const unsigned = rounded < 0 ? rounded + WORD * WORD : rounded;
    [high, low] = [Math.floor(unsigned / WORD), unsigned % WORD];
  }
  return (spec.wordOrder ?? 'high-first') === 'high-first' ? [high, low] : [low, high];
}

/** The value in engineering units of the registers `words` (starting at the spec's address). */
export function decodeRegisterValue(words: readonly number[], spec: RegisterSpec): number {
  const type = spec.type ?? 'u16';
  const first = words[0] & WORD_MASK;
  let raw: number;
  if (type === 'u16') raw = first;
  else if (type === 'i16') raw = first >= WORD / 2 ? first - WORD : first;
  else {
    const second = words[1] & WORD_MASK;
    const [high, low] = (spec.wordOrder ?? 'high-first') === 'high-first' ? [first, second] : [second, first];
    const unsigned = high * WORD + low;
    if (type === 'u32') raw = unsigned;
    else if (type === 'i32') raw = unsigned >= WORD * (WORD / 2) ? unsigned - WORD * WORD : unsigned;
    else {
      const view = new DataView(new ArrayBuffer(4));
      view.setUint16(0, high);
      view.setUint16(2, low);
      raw = view.getFloat32(0);
    }
  }
  return raw * (spec.scale ?? 1) + (spec.offset ?? 0);
}
