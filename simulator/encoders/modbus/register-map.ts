import { z } from 'zod';
import type { Frame } from '../../../shared/schemas/frame.js';
import { FIELD_NAME_PATTERN, fieldValue, type FieldName } from '../fields.js';

const REGISTER_TYPES = { uint16: 1, int16: 1, uint32: 2, int32: 2 } as const;
const WORD = 0x10000;

export const RegisterSchema = z.object({
  address: z.number().int().min(0).max(0xffff),
  field: z.string().regex(FIELD_NAME_PATTERN),
  type: z.enum(['uint16', 'int16', 'uint32', 'int32']),
  /** Engineering units per count: volts = raw × scale (0.001 → millivolts). */
  scale: z.number().finite().positive(),
});
export const RegisterMapSchema = z.object({
  registers: z.array(RegisterSchema).min(1),
  /** 32-bit values: high word at the lower address (the common choice) or the reverse. */
  wordOrder: z.enum(['high-first', 'low-first']).default('high-first'),
});
export type RegisterMap = z.infer<typeof RegisterMapSchema>;
export type RegisterMapInput = z.input<typeof RegisterMapSchema>;

/** The simulator's default holding-register map (documented in simulator/README.md). */
export const DEFAULT_REGISTER_MAP: RegisterMap = RegisterMapSchema.parse({
  registers: [
    { address: 0, field: 'volts', type: 'int32', scale: 0.001 },
    { address: 2, field: 'amps', type: 'int32', scale: 0.001 },
    { address: 4, field: 'temp:cell', type: 'int16', scale: 0.1 },
    { address: 5, field: 'temp:ambient', type: 'int16', scale: 0.1 },
    { address: 6, field: 'aux:heaterAmps', type: 'int16', scale: 0.01 },
    { address: 8, field: 'seq', type: 'uint32', scale: 1 },
    { address: 10, field: 't', type: 'uint32', scale: 0.1 },
  ],
});

const LIMITS = {
  uint16: [0, WORD - 1],
  int16: [-(WORD / 2), WORD / 2 - 1],
  uint32: [0, WORD * WORD - 1],
  int32: [-(WORD * WORD) / 2, (WORD * WORD) / 2 - 1],
} as const;

/** Number of 16-bit registers the map spans from address 0. */
export function registerSpan(map: RegisterMap): number {
  return Math.max(...map.registers.map((r) => r.address + REGISTER_TYPES[r.type]));
}

/**
 * Fills a register image from a frame: value / scale, rounded and clamped to the type's
 * range (a real meter saturates rather than wrapping); a missing channel reads 0.
 */
export function frameToRegisters(frame: Frame | undefined, map: RegisterMap): Uint16Array {
  const image = new Uint16Array(registerSpan(map));
  if (!frame) return image;
  for (const register of map.registers) {
    const value = fieldValue(frame, register.field as FieldName) ?? 0;
    const [low, high] = LIMITS[register.type];
    const raw = Math.min(high, Math.max(low, Math.round(value / register.scale)));
    const unsigned = raw < 0 ? raw + (REGISTER_TYPES[register.type] === 1 ? WORD : WORD * WORD) : raw;
    if (REGISTER_TYPES[register.type] === 1) {
      image[register.address] = unsigned;
      continue;
    }
    const highWord = Math.floor(unsigned / WORD);
    const lowWord = unsigned % WORD;
    const first = map.wordOrder === 'high-first' ? highWord : lowWord;
    const second = map.wordOrder === 'high-first' ? lowWord : highWord;
    image[register.address] = first;
    image[register.address + 1] = second;
  }
  return image;
}

/** Reads a register back into engineering units (the master's side of the map). */
export function registersToValue(words: ArrayLike<number>, register: z.infer<typeof RegisterSchema>, wordOrder: RegisterMap['wordOrder']): number {
  const size = REGISTER_TYPES[register.type];
  const at = register.address;
  let raw = size === 1 ? words[at] : wordOrder === 'high-first' ? words[at] * WORD + words[at + 1] : words[at + 1] * WORD + words[at];
  const signed = register.type === 'int16' || register.type === 'int32';
  const range = size === 1 ? WORD : WORD * WORD;
  if (signed && raw >= range / 2) raw -= range;
  return raw * register.scale;
}
