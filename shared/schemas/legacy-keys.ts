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
