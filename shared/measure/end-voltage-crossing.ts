import type { Reading } from '../schemas/reading.js';
import { SECONDS_PER_HOUR } from '../units/time.js';

/** One reading as the crossing needs it (plain JSON, kept in the detector's state). */
export interface CrossingPoint {
  /** Run time, s. */
  elapsedSeconds: number;
  volts: number;
  amps: number;
  dischargeWh: number;
  dischargeAh: number;
}

/** Copies what the crossing needs from a reading into `into` (reused) or a new point. */
export function takePoint(r: Reading, into: CrossingPoint | null): CrossingPoint {
  const p = into ?? { elapsedSeconds: 0, volts: 0, amps: 0, dischargeWh: 0, dischargeAh: 0 };
  p.elapsedSeconds = r.elapsedSeconds;
  p.volts = r.volts;
  p.amps = r.amps;
  p.dischargeWh = r.dischargeWh;
  p.dischargeAh = r.dischargeAh;
  return p;
}

/**
 * Where the voltage crossed `endVolts` between the reading before (above it) and this one
 * (at or below it), by linear interpolation of volts in time; Ah and Wh to that instant by
 * the same trapezoid the integrator uses, so the value lies between the two readings' totals.
 * Without a reading before, or across a gap (nothing was integrated there), this reading.
 */
export function crossingPoint(prev: CrossingPoint | null, r: Reading, endVolts: number, gapSeconds: number): CrossingPoint {
  const here = takePoint(r, null);
  if (prev === null || !(prev.volts > endVolts) || !(r.volts < prev.volts)) return here;
  const dt = r.elapsedSeconds - prev.elapsedSeconds;
  if (!(dt > 0) || dt > gapSeconds || prev.amps <= 0 || r.amps <= 0) return here;
  const f = (prev.volts - endVolts) / (prev.volts - r.volts);
  const amps = prev.amps + f * (r.amps - prev.amps);
  const span = f * dt;
  return {
    elapsedSeconds: prev.elapsedSeconds + span,
    volts: endVolts,
    amps,
    dischargeAh: prev.dischargeAh + (((prev.amps + amps) / 2) * span) / SECONDS_PER_HOUR,
    dischargeWh: prev.dischargeWh + (((prev.volts * prev.amps + endVolts * amps) / 2) * span) / SECONDS_PER_HOUR,
  };
}
