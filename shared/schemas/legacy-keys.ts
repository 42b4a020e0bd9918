// vocab-rename: keep (this file names the old spellings on purpose)
/**
 * Data written before the vocabulary was settled (scenario files on disk, a bench's stored
 * source configuration) used short unit suffixes (`overTempC`, `staleAfterS`, ...). It keeps
 * working: its old keys are renamed to the current ones before a schema checks it. A key
 * already in the current spelling wins.
 */
export const LEGACY_KEYS: Readonly<Record<string, string>> = {
  // Temperatures end in Celsius.
  tempC: 'tempCelsius', initialTempC: 'initialTempCelsius', onBelowC: 'onBelowCelsius', offAboveC: 'offAboveCelsius',
  overTempC: 'overTempCelsius', overTempReleaseC: 'overTempReleaseCelsius', coldChargeBelowC: 'coldChargeBelowCelsius',
  coldChargeReleaseC: 'coldChargeReleaseCelsius', ambientC: 'ambientCelsius',
  // Durations and times in seconds end in Seconds.
  staleAfterS: 'staleAfterSeconds', atS: 'atSeconds', forS: 'forSeconds', maxS: 'maxSeconds', onS: 'onSeconds', offS: 'offSeconds',
  samplePeriodS: 'readingPeriodSeconds', samplePeriodSeconds: 'readingPeriodSeconds', maxPhysicsStepS: 'maxPhysicsStepSeconds', delayS: 'delaySeconds',
  underVoltDelayS: 'underVoltDelaySeconds', underVoltRecoveryS: 'underVoltRecoverySeconds', overVoltDelayS: 'overVoltDelaySeconds',
  overVoltRecoveryS: 'overVoltRecoverySeconds', overCurrentDelayS: 'overCurrentDelaySeconds', overCurrentRecoveryS: 'overCurrentRecoverySeconds',
  coldChargeDelayS: 'coldChargeDelaySeconds', overTempDelayS: 'overTempDelaySeconds', pollS: 'pollSeconds', periodS: 'periodSeconds',
  offsetS: 'offsetSeconds', durationS: 'durationSeconds', lengthS: 'lengthSeconds', tauS: 'tauSeconds',
  // The source clock guard's state inside a stored run-session snapshot.
  lastArrivalS: 'lastArrivalSeconds', suspectArrivalS: 'suspectArrivalSeconds',
};

/** A copy of parsed JSON with every old key name replaced, at any depth. */
export function withCurrentKeys(value: unknown, table: Readonly<Record<string, string>> = LEGACY_KEYS): unknown {
  if (Array.isArray(value)) return value.map((v) => withCurrentKeys(v, table));
  if (value === null || typeof value !== 'object') return value;
  const out: Record<string, unknown> = {};
  const entries = Object.entries(value as Record<string, unknown>);
  for (const [key, v] of entries) {
    const current = Object.hasOwn(table, key) ? table[key]! : key;
    if (current !== key && Object.hasOwn(value, current)) continue;
    out[current] = withCurrentKeys(v, table);
  }
  return out;
}

/**
 * Run time on the API was once `t` (and `endT`, `cutoffT`, `crossedT`, `tripT`, `startT`) on a
 * run's events, protection trips, alarms, notes and programme step results; it is
 * `elapsedSeconds` now. Run events, summaries and step results stored as JSON keep their old
 * keys and are read through this table. Applied only
 * to those objects: a Frame's `t` (source time) is not run time and keeps its name.
 */
export const LEGACY_RUN_TIME_KEYS: Readonly<Record<string, string>> = {
  t: 'elapsedSeconds', endT: 'endElapsedSeconds', cutoffT: 'cutoffElapsedSeconds',
  crossedT: 'crossedElapsedSeconds', tripT: 'tripElapsedSeconds', startT: 'startElapsedSeconds',
};

/** The annotate request's old `t` (deprecated), from clients written before the rename. */
export const LEGACY_ANNOTATE_KEYS: Readonly<Record<string, string>> = { t: 'elapsedSeconds' };

const isRecord = (value: unknown): value is Record<string, unknown> => value !== null && typeof value === 'object' && !Array.isArray(value);

/** A stored run event (parsed JSON) with its run-time fields under their current names. */
export function eventWithCurrentKeys(value: unknown): unknown {
  return withCurrentKeys(value, LEGACY_RUN_TIME_KEYS);
}

/** A stored run summary (parsed JSON) whose protection trips carry run time under its current name. */
export function summaryWithCurrentKeys(value: unknown): unknown {
  if (!isRecord(value) || !Array.isArray(value.protectionTrips)) return value;
  return { ...value, protectionTrips: value.protectionTrips.map((trip) => withCurrentKeys(trip, LEGACY_RUN_TIME_KEYS)) };
}

/**
 * A signed-off snapshot (parsed JSON) with current keys in its notes and summary, for display
 * only: the snapshot's hash is over the stored bytes, never over this copy.
 */
export function snapshotWithCurrentKeys(value: unknown): unknown {
  if (!isRecord(value)) return value;
  const notes = Array.isArray(value.notes) ? value.notes.map((note) => withCurrentKeys(note, LEGACY_RUN_TIME_KEYS)) : value.notes;
  return { ...value, notes, summary: summaryWithCurrentKeys(value.summary) };
}
