import type { Reading } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import type { TempProtection } from '../schemas/measure-config.js';
import type { DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';

/**
 * Serialisable state of one temperature protection:
 * watch → (limit crossed while current flows) armed → (current ≈ 0 A) tripped
 * → (back inside the limit and current flows again) watch.
 */
export interface TempProtectionState {
  phase: 'watch' | 'armed' | 'tripped';
  crossedT: number;
  zero: Streak;
  /** False until the first reading with the channel (absent in older snapshots: already running). */
  started?: boolean;
}

/** A fresh state for one protection. */
export function createTempProtectionState(): TempProtectionState {
  return { phase: 'watch', crossedT: 0, zero: createStreak(), started: false };
}

function isFlowing(p: TempProtection, amps: number, zeroAmps: number): boolean {
  if (p.current === 'charge') return amps < -zeroAmps;
  if (p.current === 'discharge') return amps > zeroAmps;
  return Math.abs(amps) > zeroAmps;
}

/** Advances one temperature protection by one reading; emits protection-trip and protection-reset. */
export function detectTempProtection(s: TempProtectionState, p: TempProtection, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const temp = r.temps?.[p.channel];
  if (temp === undefined) return;
  const t = r.elapsedSeconds;
  const beyond = p.direction === 'below' ? temp < p.limitCelsius : temp > p.limitCelsius;
  const inside = p.direction === 'below' ? temp > p.limitCelsius + k.tempHysteresisCelsius : temp < p.limitCelsius - k.tempHysteresisCelsius;
  const flowing = isFlowing(p, r.amps, k.zeroAmps);
  const zero = Math.abs(r.amps) <= k.zeroAmps;
  if (s.started === false) {
    s.started = true;
    // Already past the limit at the first reading with no current: the protection is holding
    // from the start. Recorded (delay unknown, reported as 0 with beyondAtStart) so the reset
    // when current flows again (charging resumes after warming) is an event too.
    if (beyond && !flowing) {
      out.push({ type: 'protection-trip', elapsedSeconds: t, kind: p.kind, channel: p.channel, limitCelsius: p.limitCelsius, crossedElapsedSeconds: t, tempCelsius: temp, delaySeconds: 0, beyondAtStart: true });
      s.phase = 'tripped';
      return;
    }
  }
  if (s.phase === 'watch') {
    if (beyond && flowing) {
      s.phase = 'armed';
      s.crossedT = t;
      resetStreak(s.zero);
    }
    return;
  }
  if (s.phase === 'armed') {
    if (inside) {
      s.phase = 'watch'; // cooled (or warmed) back before the protection acted
      return;
    }
    if (advanceStreak(s.zero, zero, flowing, t, temp, k.confirmReadings)) {
      out.push({
        type: 'protection-trip', elapsedSeconds: s.zero.startT, kind: p.kind, channel: p.channel, limitCelsius: p.limitCelsius,
        crossedElapsedSeconds: s.crossedT, tempCelsius: s.zero.startValue, delaySeconds: Math.max(0, s.zero.startT - s.crossedT),
      });
      s.phase = 'tripped';
    }
    return;
  }
  if (inside && flowing) {
    out.push({ type: 'protection-reset', elapsedSeconds: t, kind: p.kind, channel: p.channel, tempCelsius: temp });
    s.phase = 'watch';
  }
}
