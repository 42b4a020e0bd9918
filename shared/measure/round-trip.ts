import { z } from 'zod';
import type { Reading } from '../schemas/reading.js';

/**
 * Round-trip efficiency over a matched pair: Wh out of a discharge over Wh in to the charge
 * that follows it, and only when that charge was full. A partial recharge would put back
 * less than came out and read above 100 %, so it gives "incomplete" instead of a number.
 * A charge counts as full when it put back at least the Ah taken out (no battery returns
 * more than it was given), or when its current tapered to a quarter of its peak or less
 * (a constant-voltage finish; chargers commonly end at C/20 to C/10, common practice).
 */
export const RoundTripStateSchema = z.object({
  phase: z.enum(['before-discharge', 'discharging', 'charging', 'done']),
  dischargeStartWh: z.number(),
  dischargeStartAh: z.number(),
  dischargeWh: z.number(),
  dischargeAh: z.number(),
  chargeStartWh: z.number(),
  chargeStartAh: z.number(),
  chargeWh: z.number(),
  chargeAh: z.number(),
  peakChargeAmps: z.number(),
  lastChargeAmps: z.number(),
});
/** The round-trip tracker's state, as checked by RoundTripStateSchema. */
export type RoundTripState = z.infer<typeof RoundTripStateSchema>;

/** A charge whose last current is at most this share of its peak has tapered (CV finish). */
export const TAPER_SHARE_OF_PEAK = 0.25;

/** A fresh round-trip state. */
export function createRoundTripState(): RoundTripState {
  return {
    phase: 'before-discharge', dischargeStartWh: 0, dischargeStartAh: 0, dischargeWh: 0, dischargeAh: 0,
    chargeStartWh: 0, chargeStartAh: 0, chargeWh: 0, chargeAh: 0, peakChargeAmps: 0, lastChargeAmps: 0,
  };
}

/** Follows the first discharge and the charge after it, one reading at a time (constant work). */
export function trackRoundTrip(s: RoundTripState, r: Reading, loadOnAmps: number, zeroAmps: number): void {
  const charging = r.amps < -zeroAmps;
  switch (s.phase) {
    case 'before-discharge':
      if (r.amps >= loadOnAmps) {
        s.phase = 'discharging';
        s.dischargeStartWh = r.dischargeWh;
        s.dischargeStartAh = r.dischargeAh;
      }
      return;
    case 'discharging':
      if (charging) {
        s.phase = 'charging';
        s.peakChargeAmps = -r.amps;
        s.lastChargeAmps = -r.amps;
        s.chargeWh = r.chargeWh;
        s.chargeAh = r.chargeAh;
        return;
      }
      s.dischargeWh = r.dischargeWh - s.dischargeStartWh;
      s.dischargeAh = r.dischargeAh - s.dischargeStartAh;
      s.chargeStartWh = r.chargeWh;
      s.chargeStartAh = r.chargeAh;
      return;
    case 'charging':
      if (charging) {
        s.peakChargeAmps = Math.max(s.peakChargeAmps, -r.amps);
        s.lastChargeAmps = -r.amps;
        s.chargeWh = r.chargeWh;
        s.chargeAh = r.chargeAh;
      } else if (r.amps >= loadOnAmps) {
        s.phase = 'done'; // a second discharge: the pair is closed
      }
      return;
    case 'done':
      return;
  }
}

/** The pair's efficiency (Wh out ÷ Wh in), or why there is none. */
export function roundTripResult(s: RoundTripState): { status: 'complete' | 'incomplete' | null; efficiency: number | null } {
  if (s.phase === 'before-discharge' || s.phase === 'discharging') return { status: null, efficiency: null };
  const inWh = s.chargeWh - s.chargeStartWh;
  const inAh = s.chargeAh - s.chargeStartAh;
  const full = inAh >= s.dischargeAh || s.lastChargeAmps <= s.peakChargeAmps * TAPER_SHARE_OF_PEAK;
  // More out than in cannot be a matched pair: say so rather than show it.
  if (!full || !(inWh > 0) || !(s.dischargeWh > 0) || s.dischargeWh > inWh) return { status: 'incomplete', efficiency: null };
  return { status: 'complete', efficiency: s.dischargeWh / inWh };
}
