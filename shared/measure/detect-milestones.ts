import type { Reading } from '../schemas/reading.js';
import type { MilestoneKind, RunEvent } from '../schemas/run-event.js';
import { HALF_RATED, type DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';

/** Serialisable milestone state: which capacity marks have fired, and the near-end warning latch. */
export interface MilestoneState {
  fired: MilestoneKind[];
  warned: boolean;
  warn: Streak;
}

/** A fresh milestone state. */
export function createMilestoneState(): MilestoneState {
  return { fired: [], warned: false, warn: createStreak() };
}

function mark(s: MilestoneState, kind: MilestoneKind, reached: boolean, r: Reading, out: RunEvent[]): void {
  // Totals only grow, so each capacity mark fires once and needs no hysteresis.
  if (!reached || s.fired.includes(kind)) return;
  s.fired.push(kind);
  out.push({ type: 'milestone', elapsedSeconds: r.elapsedSeconds, milestone: kind, volts: r.volts, dischargeWh: r.dischargeWh, dischargeAh: r.dischargeAh });
}

/** Advances milestone detection (50 %/100 % of rated Ah and Wh; near end voltage) by one reading. */
export function detectMilestones(s: MilestoneState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  if (k.ratedAh !== null) {
    mark(s, 'half-rated-ah', r.dischargeAh >= k.ratedAh * HALF_RATED, r, out);
    mark(s, 'rated-ah', r.dischargeAh >= k.ratedAh, r, out);
  }
  if (k.ratedWh !== null) {
    mark(s, 'half-rated-wh', r.dischargeWh >= k.ratedWh * HALF_RATED, r, out);
    mark(s, 'rated-wh', r.dischargeWh >= k.ratedWh, r, out);
  }
  if (k.warnVolts === null) return;
  const underLoad = r.amps >= k.loadOnAmps && r.volts > k.collapseVolts;
  if (s.warned) {
    // Re-arm only when clearly back above the warning level under load (hysteresis).
    if (underLoad && r.volts > k.warnVolts + k.hysteresisVolts) s.warned = false;
    return;
  }
  const holds = underLoad && r.volts < k.warnVolts;
  const breaks = r.volts > k.warnVolts + k.hysteresisVolts || !underLoad;
  if (advanceStreak(s.warn, holds, breaks, r.elapsedSeconds, r.volts, k.confirmReadings)) {
    s.warned = true;
    out.push({ type: 'milestone', elapsedSeconds: s.warn.startT, milestone: 'near-end-voltage', volts: s.warn.startValue, dischargeWh: r.dischargeWh, dischargeAh: r.dischargeAh });
    resetStreak(s.warn);
  }
}
