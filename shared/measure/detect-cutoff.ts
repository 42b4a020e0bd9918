import type { Reading } from '../schemas/reading.js';
import type { RunEvent, CutoffEvent } from '../schemas/run-event.js';
import type { DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';

/** Optional aux channel: 1 while the load is switched on, 0 when the operator switched it off. */
export const LOAD_ON_CHANNEL = 'loadOn';

type CandidateKind = 'end-voltage' | 'voltage-collapse' | 'current-zero';

/** A cutoff seen but not yet confirmed: what will be reported if it is. */
interface Candidate {
  kind: CandidateKind;
  count: number;
  t: number;
  volts: number;
  amps: number;
  dischargeWh: number;
  dischargeAh: number;
}

/** Serialisable cutoff/recovery state. */
export interface CutoffState {
  phase: 'idle' | 'discharging' | 'cut-off';
  cause: CutoffEvent['cause'] | null;
  cutoffT: number;
  sawCollapse: boolean;
  lastLoadVolts: number;
  lastLoadAmps: number;
  candidate: Candidate | null;
  after: Streak;
}

/** A fresh cutoff state (no discharge seen yet). */
export function createCutoffState(): CutoffState {
  return { phase: 'idle', cause: null, cutoffT: 0, sawCollapse: false, lastLoadVolts: 0, lastLoadAmps: 0, candidate: null, after: createStreak() };
}

function classify(r: Reading, k: DetectorSettings, loadOff: boolean): CandidateKind | null {
  if (r.volts <= k.collapseVolts) return 'voltage-collapse';
  if (k.endVolts !== null && r.volts < k.endVolts && r.amps > k.zeroAmps) return 'end-voltage';
  if (r.amps <= k.zeroAmps && !loadOff) return 'current-zero';
  return null;
}

function startCandidate(s: CutoffState, kind: CandidateKind, r: Reading): Candidate {
  // For a protection cutoff the last voltage *under load* is the one before it opened.
  const underLoad = kind === 'end-voltage';
  return {
    kind, count: 0, t: r.elapsedSeconds,
    volts: underLoad ? r.volts : s.lastLoadVolts,
    amps: underLoad ? r.amps : s.lastLoadAmps,
    dischargeWh: r.dischargeWh, dischargeAh: r.dischargeAh,
  };
}

function fire(s: CutoffState, c: Candidate, cause: CutoffEvent['cause'], out: RunEvent[]): void {
  const e: CutoffEvent = { type: 'cutoff', t: c.t, cause, volts: c.volts, amps: c.amps, dischargeWh: c.dischargeWh, dischargeAh: c.dischargeAh };
  if (cause === 'protection') e.signal = c.kind === 'current-zero' ? 'current-zero' : 'voltage-collapse';
  out.push(e);
  s.phase = 'cut-off';
  s.cause = cause;
  s.cutoffT = c.t;
  s.sawCollapse = c.kind === 'voltage-collapse';
  s.candidate = null;
  resetStreak(s.after);
}

function whileDischarging(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const loadOff = r.aux?.[LOAD_ON_CHANNEL] === 0;
  if (loadOff || r.amps < -k.zeroAmps) {
    // The operator stopped the load, or the bench went to charging: not a cutoff.
    s.phase = 'idle';
    s.candidate = null;
    return;
  }
  const kind = classify(r, k, loadOff);
  let c = s.candidate;
  if (c === null) {
    if (kind === null) {
      if (r.amps >= k.loadOnAmps) { s.lastLoadVolts = r.volts; s.lastLoadAmps = r.amps; }
      return;
    }
    c = s.candidate = startCandidate(s, kind, r);
  }
  if (c.kind === 'end-voltage') {
    if (kind === 'end-voltage') c.count++;
    // The load (or the protection) stopped once the end voltage was reached: that confirms it.
    else if (kind !== null) return fire(s, c, 'end-voltage', out);
    else if (k.endVolts !== null && r.volts > k.endVolts + k.hysteresisVolts) s.candidate = null;
  } else if (kind === 'voltage-collapse' || kind === 'current-zero') {
    c.count++;
  } else if (r.amps >= k.loadOnAmps) {
    s.candidate = null; // current back under load: a glitch, not a protection opening
  }
  if (s.candidate !== null && c.count >= k.confirmReadings) fire(s, c, c.kind === 'end-voltage' ? 'end-voltage' : 'protection', out);
  if (r.amps >= k.loadOnAmps && r.volts > k.collapseVolts) { s.lastLoadVolts = r.volts; s.lastLoadAmps = r.amps; }
}

function afterCutoff(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const t = r.elapsedSeconds;
  if (r.volts <= k.collapseVolts) s.sawCollapse = true;
  const flowing = Math.abs(r.amps) >= k.loadOnAmps && r.volts > k.collapseVolts;
  if (s.cause === 'protection') {
    const back = (s.sawCollapse && r.volts >= k.recoveryVolts) || flowing;
    const notBack = r.volts < k.recoveryVolts - k.hysteresisVolts && !flowing;
    if (advanceStreak(s.after, back, notBack, t, r.volts, k.confirmReadings)) {
      out.push({ type: 'recovery', t: s.after.startT, cutoffT: s.cutoffT, recoverySeconds: Math.max(0, s.after.startT - s.cutoffT), volts: s.after.startValue });
      s.phase = r.amps >= k.loadOnAmps ? 'discharging' : 'idle';
      resetStreak(s.after);
    }
    return;
  }
  // After an end-voltage cutoff, re-arm only once the pack is clearly above it under load again.
  const rearm = r.amps >= k.loadOnAmps && (k.endVolts === null || r.volts > k.endVolts + k.hysteresisVolts);
  if (advanceStreak(s.after, rearm, !rearm, t, r.volts, k.confirmReadings)) {
    s.phase = 'discharging';
    resetStreak(s.after);
  }
}

/** Advances cutoff and recovery detection by one reading, appending any events to out. */
export function detectCutoff(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  if (s.phase === 'idle') {
    if (r.amps >= k.loadOnAmps && r.volts > k.collapseVolts) {
      s.phase = 'discharging';
      s.lastLoadVolts = r.volts;
      s.lastLoadAmps = r.amps;
    }
    return;
  }
  if (s.phase === 'discharging') whileDischarging(s, r, k, out);
  else afterCutoff(s, r, k, out);
}
