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
