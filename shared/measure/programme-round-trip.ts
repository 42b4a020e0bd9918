import type { RoundTripPair, StepResult } from '../schemas/programme-run.js';

/** A charge that ended on its taper current: the pack is full (a charge ended by its time limit may not be). */
function fullCharge(r: StepResult): boolean {
  return r.kind === 'charge' && r.outcome === 'done' && r.cause === 'taper' && r.chargeWh > 0 && r.chargeAh > 0;
}

/**
 * Round trips of a programme: a completed discharge that began from a full charge (rests
 * between allowed), paired with the full charge that follows it; Wh out ÷ Wh in and Ah out ÷
 * Ah in. Only full-to-empty-to-full counts: a discharge from part charge followed by a full
 * charge would read far below the truth, a partial recharge above 100 % (the same reasoning as
 * the run's own round trip, `round-trip.ts`). A pair giving more out than in is left out.
 */
export function programmeRoundTrips(results: readonly StepResult[]): RoundTripPair[] {
  const pairs: RoundTripPair[] = [];
  let fromFull = false;
  let open: StepResult | null = null;
  for (const r of results) {
    if (r.kind === 'rest') continue;
    if (r.kind === 'discharge') {
      open = fromFull && r.outcome === 'done' && r.dischargeWh > 0 ? r : null;
      fromFull = false;
      continue;
    }
    if (open && fullCharge(r) && open.dischargeWh <= r.chargeWh)
      pairs.push({ dischargeIndex: open.index, chargeIndex: r.index, energyEfficiency: open.dischargeWh / r.chargeWh, coulombicEfficiency: open.dischargeAh / r.chargeAh });
    open = null;
    fromFull = fullCharge(r);
  }
  return pairs;
}
