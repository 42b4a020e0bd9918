import type { Reading } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import { HEATER_AMPS_CHANNEL } from '../schemas/frame.js';
import type { DetectorSettings } from './detector-settings.js';

const PERCENT = 100;
const STATE_VERSION = 2;

/**
 * Serialisable heater state. A heater driven by pulse-width modulation (say 2 s on, 1 s off)
 * reads "off" in its off slots: a low stretch no longer than `heaterPwmOffSeconds` is a slot,
 * not the heater switching off. Integrals run over every reading while on (slots included),
 * so the mean is the element's true average; the peak is the largest reading.
 */
export interface HeaterState {
  v: typeof STATE_VERSION;
  on: boolean;
  onT: number;
  onTemp: number | null;
  onAmps: number;
  /** High readings towards switching on (a PWM slot does not reset them). */
  highCount: number;
  /** Start of the present stretch of low readings (null while the current is up). */
  lowSinceT: number | null;
  lowCount: number;
  offTemp: number | null;
  ampSeconds: number;
  seconds: number;
  highSeconds: number;
  peakAmps: number;
  /** The integrals at the start of the present low stretch (what the heater-off event reports). */
  atLow: { ampSeconds: number; seconds: number; highSeconds: number };
  lastT: number | null;
  lastAmps: number;
}

/** A fresh heater state (heater off). */
export function createHeaterState(): HeaterState {
  return {
    v: STATE_VERSION, on: false, onT: 0, onTemp: null, onAmps: 0, highCount: 0, lowSinceT: null, lowCount: 0, offTemp: null,
    ampSeconds: 0, seconds: 0, highSeconds: 0, peakAmps: 0, atLow: { ampSeconds: 0, seconds: 0, highSeconds: 0 }, lastT: null, lastAmps: 0,
  };
}

function temperatureOf(r: Reading, channel: string | null): number | null {
  if (!r.temps) return null;
  if (channel !== null) return r.temps[channel] ?? null;
  for (const key in r.temps) return r.temps[key]!; // the first channel the source reports
  return null;
}

function accumulate(s: HeaterState, t: number, amps: number, onAmps: number): void {
  if (s.lastT !== null) {
    const dt = t - s.lastT;
    s.ampSeconds += ((s.lastAmps + amps) / 2) * dt;
    s.seconds += dt;
    if (s.lastAmps >= onAmps) s.highSeconds += dt;
  }
  s.peakAmps = Math.max(s.peakAmps, amps);
  s.lastT = t;
  s.lastAmps = amps;
}

function startCandidate(s: HeaterState, t: number, amps: number, temp: number | null): void {
  Object.assign(s, { onT: t, onTemp: temp, onAmps: amps, ampSeconds: 0, seconds: 0, highSeconds: 0, peakAmps: 0, lastT: null, lowSinceT: null, lowCount: 0 });
}

/**
 * Advances heater on/off detection by one reading (aux.heaterAmps): on after `confirmReadings`
 * high readings (PWM slots in between allowed), off after a low stretch longer than a PWM slot
 * and at least `confirmReadings` readings long; both stamped at the stretch's first reading.
 */
export function detectHeater(s: HeaterState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  if (s.v !== STATE_VERSION) Object.assign(s, createHeaterState(), { on: s.on, onT: s.onT ?? 0 }); // a state from before PWM support
  const amps = r.aux?.[HEATER_AMPS_CHANNEL];
  if (amps === undefined) return;
  const t = r.elapsedSeconds;
  const temp = temperatureOf(r, k.heaterTempChannel);
  const high = amps >= k.heaterOnAmps;
  const low = amps < k.heaterOffAmps;
  if (!s.on) {
    if (high) {
      if (s.highCount === 0) startCandidate(s, t, amps, temp);
      s.highCount++;
      s.lowSinceT = null;
    } else if (s.highCount > 0 && low) {
      s.lowSinceT ??= t;
      if (t - s.lowSinceT > k.heaterPwmOffSeconds) s.highCount = 0; // a real pause, not a PWM slot
    }
    if (s.highCount > 0) accumulate(s, t, amps, k.heaterOnAmps);
    if (s.highCount >= k.confirmReadings) {
      s.on = true;
      s.highCount = 0;
      out.push({ type: 'heater-on', elapsedSeconds: s.onT, tempCelsius: s.onTemp, heaterAmps: s.onAmps });
    }
    return;
  }
  accumulate(s, t, amps, k.heaterOnAmps);
  if (!low) {
    s.lowSinceT = null;
    return;
  }
  if (s.lowSinceT === null) {
    s.lowSinceT = t;
    s.lowCount = 0;
    s.offTemp = temp;
    s.atLow = { ampSeconds: s.ampSeconds, seconds: s.seconds, highSeconds: s.highSeconds };
  }
  s.lowCount++;
  if (s.lowCount >= k.confirmReadings && t - s.lowSinceT > k.heaterPwmOffSeconds) {
    const { ampSeconds, seconds, highSeconds } = s.atLow;
    out.push({
      type: 'heater-off', elapsedSeconds: s.lowSinceT, tempCelsius: s.offTemp,
      meanHeaterAmps: seconds > 0 ? ampSeconds / seconds : s.onAmps,
      onSeconds: Math.max(0, s.lowSinceT - s.onT),
      peakHeaterAmps: s.peakAmps,
      dutyPercent: seconds > 0 ? (highSeconds / seconds) * PERCENT : PERCENT,
    });
    s.on = false;
    s.lowSinceT = null;
  }
}
