/**
 * A run of consecutive readings that satisfy a condition, with a dead band: a reading
 * that `holds` counts, one that `breaks` resets, any other (inside the hysteresis band)
 * does neither. An event fires once, when the run reaches `confirm` readings, and is
 * stamped with the run's first reading so a confirmation delay does not bias the time.
 */
export interface Streak {
  count: number;
  startT: number;
  /** A value captured at the first reading of the run (e.g. the volts or °C there). */
  startValue: number;
}

/** A new, empty streak. */
export function createStreak(): Streak {
  return { count: 0, startT: 0, startValue: 0 };
}

/** Advances the streak by one reading; true exactly once, on the reading that confirms it. */
export function advanceStreak(s: Streak, holds: boolean, breaks: boolean, t: number, value: number, confirm: number): boolean {
  if (holds) {
    if (s.count === 0) {
      s.startT = t;
      s.startValue = value;
    }
    s.count++;
    return s.count === confirm;
  }
  if (breaks) s.count = 0;
  return false;
}

/** Empties a streak (after it fired, or when its phase ends). */
export function resetStreak(s: Streak): void {
  s.count = 0;
}
