import { SECONDS_PER_HOUR } from '../units/time.js';
/**
 * Estimated time to the end voltage and % of rated energy so far, for a discharge in
 * progress: the rated energy not yet delivered divided by the recent mean power.
 *
 * The recent mean power is the energy the integrator counted over the window divided by the
 * window's span (a time-weighted mean, so load ripple and uneven reading intervals do not
 * swing it). The estimate is withheld (null) rather than guessed when there is no rating, no
 * load, the voltage is rising (charging or recovering), too few readings or too short a
 * window, or the answer would be out of bounds.
 */

/** Span of recent readings the power is averaged over. */
export const TIME_TO_END_WINDOW_SECONDS = 120;
/** Fewest readings in the window before an estimate is shown. */
export const TIME_TO_END_MIN_READINGS = 10;
/** Shortest window span before an estimate is shown. */
export const TIME_TO_END_MIN_SPAN_SECONDS = 20;
/** Below this current the load is off (meter noise around zero). */
export const TIME_TO_END_MIN_LOAD_AMPS = 0.05;
/** A least-squares voltage slope above this over the window counts as rising (0.72 V per hour). */
export const TIME_TO_END_RISING_VOLTS_PER_SECOND = 0.0002;
/** Longest estimate shown: beyond it the number says nothing useful (100 h). */
export const TIME_TO_END_MAX_SECONDS = 100 * 3600;
/** Highest % of rated shown; above it the rating is surely wrong for this pack. */
export const PERCENT_OF_RATED_MAX = 300;

/** One reading as the estimator needs it (run time s, volts, amps positive = discharge, cumulative discharge Wh). */
export interface EstimatorReading {
  elapsedSeconds: number;
  volts: number;
  amps: number;
  dischargeWh: number;
}

/** What the screens show; null = hidden. */
export interface EndEstimate {
  secondsToEnd: number | null;
  percentOfRated: number | null;
}

/** Least-squares slope of volts over t (V/s). */
function voltsSlope(rs: readonly EstimatorReading[]): number {
  const n = rs.length;
  const meanT = rs.reduce((s, r) => s + r.elapsedSeconds, 0) / n;
  const meanV = rs.reduce((s, r) => s + r.volts, 0) / n;
  let num = 0;
  let den = 0;
  for (const r of rs) {
    num += (r.elapsedSeconds - meanT) * (r.volts - meanV);
    den += (r.elapsedSeconds - meanT) ** 2;
  }
  return den > 0 ? num / den : 0;
}

/** % of the rated energy delivered so far (null without a rating or out of bounds). */
export function percentOfRatedWh(dischargeWh: number, ratedWh: number | null): number | null {
  if (ratedWh === null || !(ratedWh > 0) || !Number.isFinite(dischargeWh) || dischargeWh < 0) return null;
  const percent = (dischargeWh / ratedWh) * 100;
  return percent <= PERCENT_OF_RATED_MAX ? percent : null;
}

/** Estimate from a window of recent readings (oldest first) and the pack's rated energy. */
export function estimateTimeToEnd(recent: readonly EstimatorReading[], ratedWh: number | null): EndEstimate {
  const last = recent.at(-1);
  if (!last) return { secondsToEnd: null, percentOfRated: null };
  const percent = percentOfRatedWh(last.dischargeWh, ratedWh);
  const hidden = { secondsToEnd: null, percentOfRated: percent };
  if (ratedWh === null || !(ratedWh > 0)) return hidden;
  const window = recent.filter((r) => r.elapsedSeconds >= last.elapsedSeconds - TIME_TO_END_WINDOW_SECONDS);
  const first = window[0]!;
  const spanSeconds = last.elapsedSeconds - first.elapsedSeconds;
  if (window.length < TIME_TO_END_MIN_READINGS || spanSeconds < TIME_TO_END_MIN_SPAN_SECONDS) return hidden;
  if (last.amps < TIME_TO_END_MIN_LOAD_AMPS) return hidden;
  if (voltsSlope(window) > TIME_TO_END_RISING_VOLTS_PER_SECOND) return hidden;
  const meanWatts = ((last.dischargeWh - first.dischargeWh) * SECONDS_PER_HOUR) / spanSeconds;
  const remainingWh = ratedWh - last.dischargeWh;
  if (!(meanWatts > 0) || !(remainingWh > 0)) return hidden;
  const seconds = (remainingWh / meanWatts) * SECONDS_PER_HOUR;
  return { secondsToEnd: seconds <= TIME_TO_END_MAX_SECONDS ? seconds : null, percentOfRated: percent };
}

/** Keeps the recent readings of one live run and answers the estimate after each. */
export class EndEstimator {
  private readonly readings: EstimatorReading[] = [];

  constructor(private readonly ratedWh: number | null) {}

  /** Adds a reading (out-of-order or non-finite ones are ignored) and returns the estimate. */
  push(r: EstimatorReading): EndEstimate {
    const last = this.readings.at(-1);
    const finite = [r.elapsedSeconds, r.volts, r.amps, r.dischargeWh].every(Number.isFinite);
    if (finite && (!last || r.elapsedSeconds > last.elapsedSeconds)) {
      this.readings.push(r);
      while (this.readings.length > 0 && this.readings[0]!.elapsedSeconds < r.elapsedSeconds - TIME_TO_END_WINDOW_SECONDS) this.readings.shift();
    }
    return estimateTimeToEnd(this.readings, this.ratedWh);
  }
}
