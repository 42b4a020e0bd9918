import { clip } from './parse-result.js';

/**
 * SCPI's not-a-number and infinity codes: SCPI-1999 Volume 1, section 7.2.1.5 (from memory)
 * — NaN is 9.91E+37, +∞ 9.9E+37, −∞ −9.9E+37. A meter sends them for overload or no reading.
 */
const SCPI_NAN = 9.91e37;
const SCPI_INFINITY = 9.9e37;
/** Relative tolerance for spotting the codes after float parsing. */
const CODE_TOLERANCE = 1e-6;

/** A parsed SCPI reply: a number, or the reason it is not one. */
export type ScpiReply = { ok: true; value: number } | { ok: false; reason: string };

/**
 * Parses a numeric SCPI reply (IEEE 488.2 NR1/NR2/NR3, e.g. `+1.23450E+01`), optionally
 * followed by a unit suffix (`12.8 V`); rejects empty replies, text and the NaN/∞ codes.
 */
export function parseScpiNumber(reply: string): ScpiReply {
  const trimmed = reply.trim();
  const match = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z°]{0,4})$/.exec(trimmed);
  if (!match) return { ok: false, reason: `'${clip(trimmed)}' is not a number` };
  const value = Number(match[1]);
  if (!Number.isFinite(value)) return { ok: false, reason: `'${clip(trimmed)}' is out of range` };
  const magnitude = Math.abs(value);
  if (Math.abs(magnitude - SCPI_NAN) / SCPI_NAN < CODE_TOLERANCE) return { ok: false, reason: 'meter reports no reading (NaN)' };
  if (Math.abs(magnitude - SCPI_INFINITY) / SCPI_INFINITY < CODE_TOLERANCE) return { ok: false, reason: 'meter reports overload (infinity)' };
  return { ok: true, value };
}
