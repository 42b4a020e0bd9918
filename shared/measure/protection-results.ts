import type { HeaterOffEvent, HeaterOnEvent, ProtectionCheckReleaseEvent, ProtectionCheckTripEvent, RunEvent } from '../schemas/run-event.js';
import {
  PROTECTION_TRAITS, delayToleranceOf, thresholdToleranceOf, type ProtectionExpectation, type ProtectionResult,
} from '../schemas/protection-check.js';

/** Seconds of run shown either side of a protection's stretch when its link opens the run page. */
export const WINDOW_MARGIN_SECONDS = 30;

type Measured = Pick<ProtectionResult, 'measuredValue' | 'measuredDelaySeconds' | 'releaseValue' | 'resumeSeconds' | 'beyondAtStart' | 'meanHeaterAmps' | 'peakHeaterAmps' | 'trips' | 'window'> & {
  acted: boolean;
  /** The signal at the first reading, when the pack started past the threshold. */
  startValue: number | null;
};

const NOTHING: Measured = {
  measuredValue: null, measuredDelaySeconds: null, releaseValue: null, resumeSeconds: null, beyondAtStart: false,
  meanHeaterAmps: null, peakHeaterAmps: null, trips: 0, window: null, acted: false, startValue: null,
};

function windowOf(fromSeconds: number, toSeconds: number): ProtectionResult['window'] {
  return { fromSeconds: Math.max(0, fromSeconds - WINDOW_MARGIN_SECONDS), toSeconds: toSeconds + WINDOW_MARGIN_SECONDS };
}

/** The first trip of a check and the release that followed it (later trips are counted). */
function fromTrips(index: number, events: readonly RunEvent[]): Measured {
  const trips = events.filter((e): e is ProtectionCheckTripEvent => e.type === 'protection-check-trip' && e.check === index);
  const first = trips[0];
  if (!first) return NOTHING;
  const release = events.find((e): e is ProtectionCheckReleaseEvent => e.type === 'protection-check-release' && e.check === index && e.tripElapsedSeconds === first.elapsedSeconds);
  return {
    ...NOTHING,
    acted: true,
    measuredValue: first.beyondAtStart ? null : first.value,
    startValue: first.beyondAtStart ? first.value : null,
    measuredDelaySeconds: first.beyondAtStart ? null : first.delaySeconds,
    releaseValue: release?.value ?? null,
    resumeSeconds: release?.resumeSeconds ?? null,
    beyondAtStart: first.beyondAtStart,
    trips: trips.length,
    window: windowOf(first.crossedElapsedSeconds ?? first.elapsedSeconds, release?.elapsedSeconds ?? first.elapsedSeconds),
  };
}

/** Heater checks read the heater's own switch events: on below its threshold, off above another. */
function fromHeater(p: ProtectionExpectation, events: readonly RunEvent[]): Measured {
  const ons = events.filter((e): e is HeaterOnEvent => e.type === 'heater-on');
  const offs = events.filter((e): e is HeaterOffEvent => e.type === 'heater-off');
  const on = ons[0];
  if (!on) return NOTHING;
  const off = offs.find((e) => e.elapsedSeconds >= on.elapsedSeconds);
  const switched = p.protection === 'heater-on' ? on : off;
  if (!switched) return { ...NOTHING, trips: 0 };
  return {
    ...NOTHING,
    acted: true,
    measuredValue: switched.tempCelsius,
    beyondAtStart: p.protection === 'heater-on' && on.elapsedSeconds === 0,
    meanHeaterAmps: off?.meanHeaterAmps ?? null,
    peakHeaterAmps: off?.peakHeaterAmps ?? null,
    trips: p.protection === 'heater-on' ? ons.length : offs.length,
    window: windowOf(switched.elapsedSeconds, switched.elapsedSeconds),
  };
}

/** True when the run's readings ever went past the threshold (from the run's per-channel extremes). */
export type ReachedFn = (p: ProtectionExpectation) => boolean | null;

/**
 * The per-protection table of a protection check: each expected threshold and delay against
 * what the run measured, pass or fail within the stated tolerance, and the stretch that shows it.
 * `reached` says whether the signal ever got past the threshold (null: not known).
 */
export function protectionResults(checks: readonly ProtectionExpectation[], events: readonly RunEvent[], reached: ReachedFn): ProtectionResult[] {
  return checks.map((p, index) => {
    const traits = PROTECTION_TRAITS[p.protection];
    const m = traits.stops === 'heater' ? fromHeater(p, events) : fromTrips(index, events);
    const thresholdTolerance = thresholdToleranceOf(p);
    const delayToleranceSeconds = delayToleranceOf(p);
    const notes: string[] = [];
    let outcome: ProtectionResult['outcome'] = 'pass';
    if (!m.acted) {
      if (reached(p) === false) {
        outcome = 'not-reached';
        notes.push(`The ${traits.signal === 'temperature' ? 'temperature' : traits.signal} never went ${traits.direction} ${p.thresholdValue} ${traits.unit}: nothing was tested.`);
      } else {
        outcome = 'fail';
        notes.push(traits.stops === 'heater' ? 'The heater did not switch.' : `Past ${p.thresholdValue} ${traits.unit} the ${traits.stops} current did not stop.`);
      }
    } else {
      if (m.beyondAtStart) {
        const at = m.startValue === null ? '' : ` (${m.startValue.toFixed(2)} ${traits.unit})`;
        notes.push(`Already past the threshold at the first reading${at}: the protection acted, its threshold was not measured.`);
      }
      if (m.measuredValue !== null && Math.abs(m.measuredValue - p.thresholdValue) > thresholdTolerance) {
        outcome = 'fail';
        notes.push(`Acted at ${m.measuredValue.toFixed(2)} ${traits.unit}, outside ${p.thresholdValue} ± ${thresholdTolerance.toFixed(2)} ${traits.unit}.`);
      }
      if (p.delaySeconds !== null && m.measuredDelaySeconds !== null && Math.abs(m.measuredDelaySeconds - p.delaySeconds) > delayToleranceSeconds) {
        outcome = 'fail';
        notes.push(`Took ${m.measuredDelaySeconds.toFixed(1)} s, outside ${p.delaySeconds} ± ${delayToleranceSeconds.toFixed(1)} s.`);
      }
      if (traits.stops !== 'heater' && m.resumeSeconds === null) notes.push('Current did not flow again before the run ended.');
    }
    return {
      protection: p.protection, unit: traits.unit, channel: traits.signal === 'temperature' ? p.channel : null,
      expectedValue: p.thresholdValue, expectedDelaySeconds: p.delaySeconds, expectedReleaseValue: p.releaseValue,
      thresholdTolerance, delayToleranceSeconds,
      measuredValue: m.measuredValue, measuredDelaySeconds: m.measuredDelaySeconds, releaseValue: m.releaseValue, resumeSeconds: m.resumeSeconds,
      beyondAtStart: m.beyondAtStart, meanHeaterAmps: m.meanHeaterAmps, peakHeaterAmps: m.peakHeaterAmps, trips: m.trips,
      outcome, notes, window: m.window,
    };
  });
}
