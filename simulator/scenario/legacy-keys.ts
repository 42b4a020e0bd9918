// vocab-rename: keep (this file names the old spellings on purpose)
/**
 * Scenario files written before the vocabulary was settled used short unit suffixes
 * (`overTempC`, `delayS`, ...). A file on disk keeps working: its old keys are renamed to the
 * current ones before the schema checks it. A key already in the current spelling wins.
 */
const LEGACY_KEYS: Readonly<Record<string, string>> = {
  tempC: 'tempCelsius', initialTempC: 'initialTempCelsius', onBelowC: 'onBelowCelsius', offAboveC: 'offAboveCelsius',
  overTempC: 'overTempCelsius', overTempReleaseC: 'overTempReleaseCelsius', coldChargeBelowC: 'coldChargeBelowCelsius',
  coldChargeReleaseC: 'coldChargeReleaseCelsius', ambientC: 'ambientCelsius',
};

/** A copy of a parsed scenario file with every old key name replaced, at any depth. */
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
