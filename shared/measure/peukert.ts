import type { Chemistry } from '../schemas/chemistry.js';

/**
 * Peukert's law (W. Peukert, 1897): at constant current I a battery lasts t with I^k·t about
 * constant, k the Peukert exponent (1 for an ideal battery). Found for lead-acid cells at
 * constant current and temperature; it knows nothing of temperature, ageing or the end voltage.
 */

/**
 * Peukert runtime estimate in the published form t = H·(C/(I·H))^k, where C is the rated
 * capacity (Ah) at the H-hour rate, I the discharge current (A) and k the Peukert exponent
 * (1 for an ideal battery; about 1.1–1.3 for lead-acid, common practice). Returns hours.
 */
export function peukertRuntimeHours(ratedAh: number, ratedHours: number, amps: number, k: number): number {
  if (!(ratedAh > 0) || !(ratedHours > 0) || !(amps > 0) || !(k > 0)) throw new RangeError('peukertRuntimeHours: all arguments must be positive');
  return ratedHours * (ratedAh / (amps * ratedHours)) ** k;
}

/** Capacity (Ah) available at a current by Peukert: I × t(I). */
export function peukertCapacityAh(ratedAh: number, ratedHours: number, amps: number, k: number): number {
  return amps * peukertRuntimeHours(ratedAh, ratedHours, amps, k);
}

/**
 * Hours a pack would last at `amps`, from one measured discharge (`testAh` delivered at a mean
 * `testAmps`): the published form with the test as the rating, t = t_test·(I_test/I)^k.
 */
export function peukertRuntimeFromTest(testAh: number, testAmps: number, amps: number, k: number): number {
  if (!(testAmps > 0)) throw new RangeError('peukertRuntimeFromTest: the test current must be positive');
  return peukertRuntimeHours(testAh, testAh / testAmps, amps, k);
}

/**
 * A typical Peukert exponent per chemistry, for an estimate when the pack's own is unknown:
 * flooded lead-acid 1.2–1.3, NiMH 1.05–1.1, lithium-ion and LiFePO4 about 1.05 (typical values
 * as tabled at utilitiesbunker.com/kb/peukert-law; common practice). Null: no typical value.
 */
export const TYPICAL_PEUKERT_EXPONENT: Record<Chemistry, number | null> = {
  'lead-acid': 1.25,
  nimh: 1.08,
  lfp: 1.05,
  nmc: 1.05,
  nca: 1.05,
  lto: 1.05,
  other: null,
};
