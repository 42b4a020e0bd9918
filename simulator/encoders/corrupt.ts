import type { Prng } from '../prng.js';

/** Characters a noisy line tends to produce: none of them fits a number. */
const GARBAGE = '#?~@%&*^';

/**
 * Damages a text line as a flaky cable would: a character swapped for garbage, or the
 * line cut short. The line ending stays, so the next line still frames correctly.
 */
export function corruptLine(line: string, prng: Prng): string {
  const ending = line.endsWith('\r\n') ? '\r\n' : line.endsWith('\n') ? '\n' : '';
  const body = line.slice(0, line.length - ending.length);
  if (body.length === 0) return line;
  const position = Math.floor(prng.next() * body.length);
  if (prng.next() < 0.5) return body.slice(0, Math.max(1, position)) + ending;
  const garbage = GARBAGE[Math.floor(prng.next() * GARBAGE.length)];
  return body.slice(0, position) + garbage + body.slice(position + 1) + ending;
}

/** Damages a binary reply by flipping one bit, which its CRC then exposes. */
export function corruptBytes(bytes: Uint8Array, prng: Prng): Uint8Array {
  const copy = Uint8Array.from(bytes);
  const position = Math.floor(prng.next() * copy.length);
  copy[position] ^= 1 << Math.floor(prng.next() * 8);
  return copy;
}
