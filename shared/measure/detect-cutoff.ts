import type { Reading } from '../schemas/reading.js';
import type { RunEvent, CutoffEvent } from '../schemas/run-event.js';
import type { DetectorSettings } from './detector-settings.js';
import { advanceStreak, createStreak, resetStreak, type Streak } from './streak.js';
import { crossingPoint, takePoint, type CrossingPoint } from './end-voltage-crossing.js';

/** Optional aux channel: 1 while the load is switched on, 0 when the operator switched it off. */
export const LOAD_ON_CHANNEL = 'loadOn';

const RESUMED_NOTE = 'discharge current back (after a pause or a protection reconnect)';

type CandidateKind = 'end-voltage' | 'voltage-collapse' | 'current-zero';

/** A cutoff seen but not yet confirmed: what will be reported if it is. */
interface Candidate {
  kind: CandidateKind;
  count: number;
  /** Run time of the candidate's reading, s. */
  elapsedSeconds: number;
  volts: number;
  amps: number;
  dischargeWh: number;
  dischargeAh: number;
  /** A protection candidate that saw the terminal voltage collapse (else the current only fell to 0 A). */
  collapsed?: boolean;
}

/** Serialisable cutoff/recovery state. */
export interface CutoffState {
  phase: 'idle' | 'discharging' | 'cut-off';
  cause: CutoffEvent['cause'] | null;
  cutoffElapsedSeconds: number;
  sawCollapse: boolean;
  lastLoadVolts: number;
  lastLoadAmps: number;
  candidate: Candidate | null;
  after: Streak;
  /** The reading before this one (for the interpolated end-voltage crossing). Absent in older snapshots. */
  prev?: CrossingPoint | null;
  /** A discharge reading above the end voltage was seen since the last charge (else the test started below it). */
  sawAboveEnd?: boolean;
  /** A pause (`load-off`) was reported; the load coming back is reported as `load-on`. */
  paused?: boolean;
}

/** A fresh cutoff state (no discharge seen yet). */
export function createCutoffState(): CutoffState {
  return {
    phase: 'idle', cause: null, cutoffElapsedSeconds: 0, sawCollapse: false, lastLoadVolts: 0, lastLoadAmps: 0, candidate: null, after: createStreak(),
    prev: null, sawAboveEnd: false, paused: false,
  };
}

// The end-voltage test is `≤`: a load that stops itself exactly at the end voltage has reached it.
function classify(r: Reading, k: DetectorSettings): CandidateKind | null {
  if (r.volts <= k.collapseVolts) return 'voltage-collapse';
  if (k.endVolts !== null && r.volts <= k.endVolts && r.amps > k.zeroAmps) return 'end-voltage';
  if (r.amps <= k.zeroAmps) return 'current-zero';
  return null;
}

function startCandidate(s: CutoffState, kind: CandidateKind, r: Reading, k: DetectorSettings): Candidate {
  if (kind === 'end-voltage' && k.endVolts !== null) {
    // Stamped where the voltage crossed the end voltage, interpolated between this reading and the one before.
    const x = crossingPoint(s.prev ?? null, r, k.endVolts, k.gapSeconds);
    return { kind, count: 0, elapsedSeconds: x.elapsedSeconds, volts: x.volts, amps: x.amps, dischargeWh: x.dischargeWh, dischargeAh: x.dischargeAh };
  }
  // For a protection cutoff the last voltage *under load* is the one before it opened.
  return { kind, count: 0, elapsedSeconds: r.elapsedSeconds, volts: s.lastLoadVolts, amps: s.lastLoadAmps, dischargeWh: r.dischargeWh, dischargeAh: r.dischargeAh, collapsed: false };
}

function fireEndVoltage(s: CutoffState, c: Candidate, out: RunEvent[]): void {
  const e: CutoffEvent = { type: 'cutoff', elapsedSeconds: c.elapsedSeconds, cause: 'end-voltage', volts: c.volts, amps: c.amps, dischargeWh: c.dischargeWh, dischargeAh: c.dischargeAh };
  // No discharge reading above the end voltage: the pack was already below it when the load came on.
  if (s.sawAboveEnd === false) e.startedBelowEndVoltage = true;
  out.push(e);
  enterCutOff(s, c, 'end-voltage');
}

function fireProtection(s: CutoffState, c: Candidate, out: RunEvent[]): void {
  out.push({
    type: 'cutoff', elapsedSeconds: c.elapsedSeconds, cause: 'protection', signal: c.collapsed ? 'voltage-collapse' : 'current-zero',
    volts: c.volts, amps: c.amps, dischargeWh: c.dischargeWh, dischargeAh: c.dischargeAh,
  });
  enterCutOff(s, c, 'protection');
  s.sawCollapse = c.collapsed === true;
}

function enterCutOff(s: CutoffState, c: Candidate, cause: CutoffEvent['cause']): void {
  s.phase = 'cut-off';
  s.cause = cause;
  s.cutoffElapsedSeconds = c.elapsedSeconds;
  s.sawCollapse = false;
  s.candidate = null;
  resetStreak(s.after);
}

/** The current fell to about 0 A with the terminal voltage held and no load signal: a pause, not a protection trip. */
function firePause(s: CutoffState, c: Candidate, out: RunEvent[]): void {
  out.push({ type: 'load-off', elapsedSeconds: c.elapsedSeconds, note: 'current fell to about 0 A with the voltage held: a pause, not counted as a protection trip' });
  s.phase = 'idle';
  s.candidate = null;
  s.paused = true;
}

function trackLoad(s: CutoffState, r: Reading, k: DetectorSettings): void {
  if (r.amps >= k.loadOnAmps && r.volts > k.collapseVolts) {
    s.lastLoadVolts = r.volts;
    s.lastLoadAmps = r.amps;
    if (k.endVolts === null || r.volts > k.endVolts) s.sawAboveEnd = true;
  }
}

function whileDischarging(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const loadSignal = r.aux?.[LOAD_ON_CHANNEL];
  if (loadSignal === 0 || r.amps < -k.zeroAmps) {
    // The operator stopped the load, or the bench went to charging: not a cutoff.
    s.phase = 'idle';
    s.candidate = null;
    return;
  }
  const kind = classify(r, k);
  let c = s.candidate;
  if (c === null) {
    if (kind === null) return trackLoad(s, r, k);
    c = s.candidate = startCandidate(s, kind, r, k);
  }
  if (c.kind === 'end-voltage') {
    if (kind === 'end-voltage') c.count++;
    // The load (or the protection) stopped once the end voltage was reached: that confirms it.
    else if (kind !== null) return fireEndVoltage(s, c, out);
    // Back above the end voltage under load: the readings below it were not consecutive (noise).
    else s.candidate = null;
    if (s.candidate !== null && c.count >= k.confirmReadings) fireEndVoltage(s, c, out);
  } else {
    if (kind === 'voltage-collapse' || kind === 'current-zero') {
      c.count++;
      if (kind === 'voltage-collapse') c.collapsed = true;
    } else if (r.amps >= k.loadOnAmps) {
      s.candidate = null; // current back under load: a glitch, not a protection opening
    }
    if (s.candidate !== null && c.count >= k.confirmReadings) {
      // Without a collapse, only a load that says it is on (aux.loadOn = 1) makes 0 A a protection trip.
      if (c.collapsed || loadSignal === 1) fireProtection(s, c, out);
      else firePause(s, c, out);
    }
  }
  trackLoad(s, r, k);
}

function afterCutoff(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  const t = r.elapsedSeconds;
  if (r.volts <= k.collapseVolts) s.sawCollapse = true;
  const flowing = Math.abs(r.amps) >= k.loadOnAmps && r.volts > k.collapseVolts;
  if (s.cause === 'protection') {
    const back = (s.sawCollapse && r.volts >= k.recoveryVolts) || flowing;
    const notBack = r.volts < k.recoveryVolts - k.hysteresisVolts && !flowing;
    if (advanceStreak(s.after, back, notBack, t, r.volts, k.confirmReadings)) {
      out.push({ type: 'recovery', elapsedSeconds: s.after.startT, cutoffElapsedSeconds: s.cutoffElapsedSeconds, recoverySeconds: Math.max(0, s.after.startT - s.cutoffElapsedSeconds), volts: s.after.startValue });
      resetStreak(s.after);
      // Whether the discharge goes on after the reconnect decides whether the trip ended the test: say when it does.
      if (r.amps >= k.loadOnAmps) {
        s.phase = 'discharging';
        out.push({ type: 'load-on', elapsedSeconds: t, note: RESUMED_NOTE });
      } else {
        s.phase = 'idle';
        s.paused = true;
      }
    }
    return;
  }
  // After the end voltage the discharge has been measured: noise on a plateau or the load
  // running on must not make more cutoffs. Only a charge re-arms (a new discharge may follow).
  const charging = r.amps < -k.zeroAmps;
  if (advanceStreak(s.after, charging, !charging, t, r.volts, k.confirmReadings)) {
    s.phase = 'idle';
    s.sawAboveEnd = false;
    resetStreak(s.after);
  }
}

/** Advances cutoff and recovery detection by one reading, appending any events to out. */
export function detectCutoff(s: CutoffState, r: Reading, k: DetectorSettings, out: RunEvent[]): void {
  if (s.phase === 'idle') {
    if (r.amps < -k.zeroAmps) s.sawAboveEnd = false; // a charge: the next discharge is a new test
    if (r.amps >= k.loadOnAmps && r.volts > k.collapseVolts) {
      s.phase = 'discharging';
      if (s.paused) out.push({ type: 'load-on', elapsedSeconds: r.elapsedSeconds, note: RESUMED_NOTE });
      s.paused = false;
      trackLoad(s, r, k);
    }
  } else if (s.phase === 'discharging') whileDischarging(s, r, k, out);
  else afterCutoff(s, r, k, out);
  s.prev = takePoint(r, s.prev ?? null);
}
