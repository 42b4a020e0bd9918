import type { Reading } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import { HEATER_AMPS_CHANNEL } from '../schemas/frame.js';
import { PROTECTION_TRAITS, type ProtectionExpectation } from '../schemas/protection-check.js';
import type { DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';

/** Share of a current threshold used as the hysteresis band on it. */
const AMPS_HYSTERESIS_SHARE = 0.01;

/**
 * Serialisable state of one checked protection:
 * start (no reading yet) → watch → (past the threshold while current flows) armed
 * → (current stopped for confirmReadings readings) tripped → (current flows again) watch.
 * A pack already past the threshold at its first reading with no current flowing goes
 * straight towards tripped: the check is recorded, its threshold marked not measured.
 */
export interface ProtectionCheckState {
  phase: 'start' | 'watch' | 'armed' | 'tripped';
  crossedT: number | null;
  beyondAtStart: boolean;
  tripT: number;
  /** The signal at the previous reading (the last one before the current stopped, once it has). */
  prevValue: number | null;
  stopped: Streak;
  flowing: Streak;
}

/** A fresh state for one check. */
export function createProtectionCheckState(): ProtectionCheckState {
  return { phase: 'start', crossedT: null, beyondAtStart: false, tripT: 0, prevValue: null, stopped: createStreak(), flowing: createStreak() };
}

/** The value a check watches in a reading (°C, pack V, discharge A), or undefined when the reading lacks it. */
export function signalOf(p: ProtectionExpectation, r: Reading): number | undefined {
  const traits = PROTECTION_TRAITS[p.protection];
  if (traits.signal === 'volts') return r.volts;
  if (traits.signal === 'amps') return r.amps;
  if (!r.temps) return undefined;
  if (p.channel !== null) return r.temps[p.channel];
  for (const key in r.temps) return r.temps[key]; // the first channel the source reports
  return undefined;
}

/**
 * Charge current into the cells: the terminal's charge amps less the heater's, when the bench
 * reports it (a heater fed from the charger side draws current while the BMS blocks the cells).
 */
function chargeIntoCells(r: Reading): number {
  return -r.amps - (r.aux?.[HEATER_AMPS_CHANNEL] ?? 0);
}

function hysteresisOf(p: ProtectionExpectation, k: DetectorSettings): number {
  const signal = PROTECTION_TRAITS[p.protection].signal;
  if (signal === 'temperature') return k.tempHysteresisCelsius;
  if (signal === 'volts') return k.hysteresisVolts;
  return Math.abs(p.thresholdValue) * AMPS_HYSTERESIS_SHARE;
}

/** Advances one checked protection by one reading; emits protection-check-trip and -release. Heater checks are read from heater events instead. */
export function detectProtectionCheck(s: ProtectionCheckState, index: number, p: ProtectionExpectation, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const traits = PROTECTION_TRAITS[p.protection];
  if (traits.stops === 'heater') return;
  const value = signalOf(p, r);
  if (value === undefined) return;
  const t = r.elapsedSeconds;
  const current = traits.stops === 'charge' ? chargeIntoCells(r) : r.amps;
  const flowing = current > k.zeroAmps;
  const beyond = traits.direction === 'below' ? value < p.thresholdValue : value > p.thresholdValue;
  const h = hysteresisOf(p, k);
  const inside = traits.direction === 'below' ? value > p.thresholdValue + h : value < p.thresholdValue - h;
  const prev = s.prevValue ?? value;
  s.prevValue = value;

  if (s.phase === 'start') {
    s.phase = beyond ? 'armed' : 'watch';
    s.beyondAtStart = beyond;
    s.crossedT = beyond && flowing ? t : null;
  } else if (s.phase === 'watch') {
    if (beyond && flowing) {
      s.phase = 'armed';
      s.crossedT = t;
      s.beyondAtStart = false;
      resetStreak(s.stopped);
    }
    return;
  }
  if (s.phase === 'armed') {
    if (flowing && inside) {
      s.phase = 'watch'; // back inside before the protection acted
      resetStreak(s.stopped);
      return;
    }
    if (advanceStreak(s.stopped, !flowing, flowing, t, s.stopped.count === 0 ? prev : value, k.confirmReadings)) {
      s.tripT = s.stopped.startT;
      out.push({
        type: 'protection-check-trip', elapsedSeconds: s.tripT, protection: p.protection, check: index, crossedElapsedSeconds: s.crossedT,
        value: s.stopped.startValue, delaySeconds: s.crossedT === null ? null : Math.max(0, s.tripT - s.crossedT), beyondAtStart: s.beyondAtStart,
      });
      s.phase = 'tripped';
      resetStreak(s.stopped);
      resetStreak(s.flowing);
    }
    return;
  }
  if (s.phase === 'tripped' && advanceStreak(s.flowing, flowing, !flowing, t, value, k.confirmReadings)) {
    out.push({
      type: 'protection-check-release', elapsedSeconds: s.flowing.startT, protection: p.protection, check: index, tripElapsedSeconds: s.tripT,
      value: s.flowing.startValue, resumeSeconds: Math.max(0, s.flowing.startT - s.tripT),
    });
    s.phase = 'watch';
    s.beyondAtStart = false;
    resetStreak(s.flowing);
  }
}
