import { PROTECTIONS, PROTECTION_TRAITS, type Protection, type ProtectionSpec } from '../../../../shared/schemas/protection-check';
import { celsiusToFahrenheit, fahrenheitToCelsius } from '../../../lib/units';

/** One protection's row on the pack form, as typed (temperatures in the lab's unit). */
export interface SpecRow {
  threshold: string;
  delay: string;
  release: string;
}
export type SpecRows = Record<Protection, SpecRow>;

const isTemperature = (p: Protection) => PROTECTION_TRAITS[p].signal === 'temperature';
const show = (p: Protection, v: number | null, unit: 'C' | 'F') => (v === null ? '' : String(isTemperature(p) && unit === 'F' ? Math.round(celsiusToFahrenheit(v) * 100) / 100 : v));
const read = (text: string): number | null => (text.trim() === '' ? null : Number(text.trim().replace(',', '.')));

/** The form's rows for a pack's stated protections (empty rows for the rest). */
export function rowsFromSpecs(specs: readonly ProtectionSpec[], unit: 'C' | 'F'): SpecRows {
  return Object.fromEntries(
    PROTECTIONS.map((p) => {
      const s = specs.find((x) => x.protection === p);
      return [p, { threshold: show(p, s?.thresholdValue ?? null, unit), delay: s?.delaySeconds == null ? '' : String(s.delaySeconds), release: show(p, s?.releaseValue ?? null, unit) }];
    }),
  ) as SpecRows;
}

/**
 * The pack's stated protections from the form: a row with a threshold is stated (°C from the
 * lab's unit); a delay or release typed without a threshold is refused. Tolerances already in
 * the record are kept.
 */
export function specsFromRows(rows: SpecRows, unit: 'C' | 'F', previous: readonly ProtectionSpec[]): { specs: ProtectionSpec[]; errors: Partial<Record<Protection, string>> } {
  const specs: ProtectionSpec[] = [];
  const errors: Partial<Record<Protection, string>> = {};
  const toCelsius = (p: Protection, v: number | null) => (v !== null && isTemperature(p) && unit === 'F' ? fahrenheitToCelsius(v) : v);
  for (const p of PROTECTIONS) {
    const r = rows[p];
    const threshold = read(r.threshold);
    const delay = read(r.delay);
    const release = read(r.release);
    if (threshold === null) {
      if (delay !== null || release !== null) errors[p] = 'Give the threshold too, or clear the row.';
      continue;
    }
    if (![threshold, delay ?? 0, release ?? 0].every(Number.isFinite) || (delay !== null && delay < 0)) {
      errors[p] = 'Numbers only; a delay of 0 s or more.';
      continue;
    }
    const before = previous.find((s) => s.protection === p);
    specs.push({
      protection: p, thresholdValue: toCelsius(p, threshold)!, delaySeconds: delay, releaseValue: toCelsius(p, release),
      thresholdTolerance: before?.thresholdTolerance ?? null, delayToleranceSeconds: before?.delayToleranceSeconds ?? null,
    });
  }
  return { specs, errors };
}
