import type { Reading } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import { HEATER_AMPS_CHANNEL } from '../schemas/frame.js';
import type { DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';

/** Serialisable heater state; ampSeconds/onSeconds give the time-weighted mean current while on. */
export interface HeaterState {
  on: boolean;
  onT: number;
  onStreak: Streak;
  offStreak: Streak;
  /** Temperature at the start of the off streak (null when none). */
  offTemp: number | null;
  onTemp: number | null;
  ampSeconds: number;
  onSeconds: number;
  lastT: number | null;
  lastAmps: number;
}

/** A fresh heater state (heater off). */
export function createHeaterState(): HeaterState {
  return { on: false, onT: 0, onStreak: createStreak(), offStreak: createStreak(), offTemp: null, onTemp: null, ampSeconds: 0, onSeconds: 0, lastT: null, lastAmps: 0 };
}

function temperatureOf(r: Reading, channel: string | null): number | null {
  if (!r.temps) return null;
  if (channel !== null) return r.temps[channel] ?? null;
  for (const key in r.temps) return r.temps[key]!; // the first channel the source reports
  return null;
}

function accumulate(s: HeaterState, t: number, amps: number, heating: boolean): void {
  // Trapezoid over consecutive heating readings only, so a dropout does not drag the mean down.
  if (heating && s.lastT !== null) {
    s.ampSeconds += ((s.lastAmps + amps) / 2) * (t - s.lastT);
    s.onSeconds += t - s.lastT;
  }
  s.lastT = heating ? t : null;
  s.lastAmps = amps;
}

/** Advances heater on/off detection by one reading (aux.heaterAmps), with hysteresis and confirmation. */
export function detectHeater(s: HeaterState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const amps = r.aux?.[HEATER_AMPS_CHANNEL];
  if (amps === undefined) return;
  const t = r.elapsedSeconds;
  const temp = temperatureOf(r, k.heaterTempChannel);
  const high = amps >= k.heaterOnAmps;
  const low = amps < k.heaterOffAmps;
  if (!s.on) {
    if (s.onStreak.count === 0 && high) {
      s.ampSeconds = 0;
      s.onSeconds = 0;
      s.lastT = null;
      s.onTemp = temp;
    }
    if (advanceStreak(s.onStreak, high, low, t, amps, k.confirmReadings)) {
      s.on = true;
      s.onT = s.onStreak.startT;
      resetStreak(s.onStreak);
      out.push({ type: 'heater-on', t: s.onT, tempCelsius: s.onTemp, heaterAmps: s.onStreak.startValue });
    }
    if (s.onStreak.count > 0 || s.on) accumulate(s, t, amps, !low);
    return;
  }
  if (s.offStreak.count === 0 && low) s.offTemp = temp;
  accumulate(s, t, amps, !low);
  if (advanceStreak(s.offStreak, low, high, t, amps, k.confirmReadings)) {
    s.on = false;
    resetStreak(s.offStreak);
    const mean = s.onSeconds > 0 ? s.ampSeconds / s.onSeconds : s.lastAmps;
    out.push({ type: 'heater-off', t: s.offStreak.startT, tempCelsius: s.offTemp, meanHeaterAmps: mean, onSeconds: Math.max(0, s.offStreak.startT - s.onT) });
  }
}
