import type { RegisterSpec } from '../../../shared/schemas/bench.js';

/**
 * Most holding registers one "read holding registers" (function 03) request may ask for:
 * Modbus Application Protocol Specification V1.1b3, section 6.3 (quantity 1 to 125).
 */
export const MAX_REGISTERS_PER_READ = 125;
const WORD = 0x10000;
const SIGN_16 = 0x8000;
const SIGN_32 = 0x80000000;
const TWO_POW_32 = 0x100000000;

/** One contiguous block of holding registers to read. */
export interface ReadBlock {
  start: number;
  count: number;
}

/** How many 16-bit registers a value of this type takes. */
export function registerWidth(type: RegisterSpec['type']): number {
  return type === 'u16' || type === 'i16' ? 1 : 2;
}

/** Groups register specs into the fewest contiguous reads of at most 125 registers each. */
export function planReads(specs: RegisterSpec[]): ReadBlock[] {
  const sorted = [...specs].sort((a, b) => a.address - b.address);
  const blocks: ReadBlock[] = [];
  for (const spec of sorted) {
    const end = spec.address + registerWidth(spec.type);
    const last = blocks[blocks.length - 1];
    if (last && end - last.start <= MAX_REGISTERS_PER_READ) {
      last.count = Math.max(last.count, end - last.start);
    } else {
      blocks.push({ start: spec.address, count: end - spec.address });
    }
  }
  return blocks;
}

/**
 * Decodes one value from words read starting at `blockStart`: raw × scale + offset.
 * Returns undefined when the words do not cover the register (a short reply).
 */
export function decodeRegister(words: readonly number[], blockStart: number, spec: RegisterSpec): number | undefined {
  const index = spec.address - blockStart;
  const width = registerWidth(spec.type);
  if (index < 0 || index + width > words.length) return undefined;
  const first = words[index]! & 0xffff;
  let raw: number;
  if (spec.type === 'u16') raw = first;
  else if (spec.type === 'i16') raw = first >= SIGN_16 ? first - WORD : first;
  else {
    const second = words[index + 1]! & 0xffff;
    const [high, low] = spec.wordOrder === 'high-first' ? [first, second] : [second, first];
    const unsigned = high * WORD + low;
    if (spec.type === 'u32') raw = unsigned;
    else if (spec.type === 'i32') raw = unsigned >= SIGN_32 ? unsigned - TWO_POW_32 : unsigned;
    else {
      const buf = Buffer.alloc(4);
      buf.writeUInt16BE(high, 0);
      buf.writeUInt16BE(low, 2);
      raw = buf.readFloatBE(0);
    }
  }
  return raw * spec.scale + spec.offset;
}
