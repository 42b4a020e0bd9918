import type { CutoffEvent, RecoveryEvent, RunEvent } from '../schemas/run-event.js';
import type { CapacityEndedBy, ProtectionTrip } from '../schemas/run-summary.js';
import type { RunTotals } from '../schemas/reading.js';

/** At most this many protection trips are listed in a summary (the count is always given). */
export const MAX_TRIPS_LISTED = 100;

/** What a capacity run measured: the capacity to its end (or why there is none) and the trips on the way. */
export interface CapacityResult {
  endedBy: CapacityEndedBy;
  /** Null when the run is incomplete (see `endedBy`). */
  capacityAh: number | null;
  capacityWh: number | null;
  /** Run time of the capacity's end (the end-voltage crossing or the protection trip), s. */
  endSeconds: number | null;
  /** The cutoff that ended the capacity, if one did. */
  cutoff: CutoffEvent | null;
  trips: ProtectionTrip[];
  tripCount: number;
}

/** What capacityResult reads besides the events. */
export interface CapacityInput {
  events: readonly RunEvent[];
  totals: RunTotals;
  /** The run's end voltage (null when only the pack's protection ends it). */
  endVolts: number | null;
  /** The run has ended (finished or stopped); false while it records. */
  ended: boolean;
  /** A protection trip ends the test even when the pack reconnects (the run says so). */
  protectionEndsTest: boolean;
  /** The run had a discharge under load at all. */
  sawLoad: boolean;
}

/** Verdicts are only given for these ends; the others are incomplete. */
export const COMPLETE_ENDS: ReadonlySet<CapacityEndedBy> = new Set<CapacityEndedBy>(['end-voltage', 'protection', 'run-end']);

/**
 * Reads a capacity run's events: capacity to the first confirmed end-voltage crossing; the
 * protection trips on the way (a trip after which the discharge goes on does not end the
 * test unless `protectionEndsTest`); a last trip after which no discharge followed, whether
 * the pack reconnected or not, ends it; a run without an end voltage ends with its totals. Started below the end voltage, stopped by hand before it,
 * or still recording: incomplete, with no capacity figure.
 */
export function capacityResult(input: CapacityInput): CapacityResult {
  const cutoffs = input.events.filter((e): e is CutoffEvent => e.type === 'cutoff');
  const recoveries = input.events.filter((e): e is RecoveryEvent => e.type === 'recovery');
  const protections = cutoffs.filter((c) => c.cause === 'protection');
  const trips: ProtectionTrip[] = protections.slice(0, MAX_TRIPS_LISTED).map((c) => ({
    elapsedSeconds: c.elapsedSeconds, volts: c.volts, amps: c.amps, dischargeAh: c.dischargeAh, dischargeWh: c.dischargeWh,
    signal: c.signal ?? 'voltage-collapse',
    recoverySeconds: recoveries.find((r) => r.cutoffElapsedSeconds === c.elapsedSeconds)?.recoverySeconds ?? null,
  }));
  const base = { trips, tripCount: protections.length };
  const endCut = cutoffs.find((c) => c.cause === 'end-voltage') ?? null;
  const at = (c: CutoffEvent, endedBy: CapacityEndedBy): CapacityResult => ({ ...base, endedBy, capacityAh: c.dischargeAh, capacityWh: c.dischargeWh, endSeconds: c.elapsedSeconds, cutoff: c });
  const none = (endedBy: CapacityEndedBy): CapacityResult => ({ ...base, endedBy, capacityAh: null, capacityWh: null, endSeconds: null, cutoff: null });

  const firstTrip = protections[0];
  if (input.protectionEndsTest && firstTrip && (endCut === null || firstTrip.elapsedSeconds < endCut.elapsedSeconds)) return at(firstTrip, 'protection');
  if (endCut) return endCut.startedBelowEndVoltage ? none('started-below-end-voltage') : at(endCut, 'end-voltage');
  // The last trip ended the test unless the discharge went on after it (a `load-on` after the trip).
  const lastTrip = protections.at(-1);
  if (lastTrip && !input.events.some((e) => e.type === 'load-on' && e.elapsedSeconds > lastTrip.elapsedSeconds)) return at(lastTrip, 'protection');
  if (!input.sawLoad) return none('no-discharge');
  if (!input.ended) return none('in-progress');
  if (input.endVolts === null) {
    return { ...base, endedBy: 'run-end', capacityAh: input.totals.dischargeAh, capacityWh: input.totals.dischargeWh, endSeconds: null, cutoff: null };
  }
  return none('stopped-before-end-voltage');
}
