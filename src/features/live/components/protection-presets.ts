import { PROTECTIONS, PROTECTION_TRAITS, type Protection, type ProtectionRequest, type ProtectionSpec } from '../../../../shared/schemas/protection-check';
import { fahrenheitToCelsius } from '../../../lib/units';

/**
 * Common practice (no source): LFP packs refuse charge near 0 °C, and heaters in heated packs
 * switch on near 0 °C and off near 5 °C. Offered when neither the run nor the pack's record
 * states a threshold; every other protection needs a value from the pack's maker.
 */
export const COMMON_PRACTICE_CELSIUS: Partial<Record<Protection, number>> = { 'cold-charge': 0, 'heater-on': 0, 'heater-off': 5 };

/** One protection's row on the start form, as typed (temperatures in the lab's unit). */
export interface ProtectionChoice {
  on: boolean;
  threshold: string;
  delay: string;
}
export type ProtectionChoices = Record<Protection, ProtectionChoice>;

/** Every row unticked and empty. */
export function emptyChoices(): ProtectionChoices {
  return Object.fromEntries(PROTECTIONS.map((p) => [p, { on: false, threshold: '', delay: '' }])) as ProtectionChoices;
}

/** What the form sends, or the rows it refuses and why (a value typed on an unticked row is never dropped silently). */
export type ProtectionChoiceResult = { ok: true; checks: ProtectionRequest[] } | { ok: false; errors: Partial<Record<Protection, string>> };

const number = (text: string): number | null => (text.trim() === '' ? null : Number(text.trim().replace(',', '.')));

/**
 * The protections a protection check times, from the start form: ticked rows, thresholds in °C
 * (typed in the lab's unit), pack volts or amps. A threshold left empty comes from the pack's
 * record, else from common practice where there is one; otherwise the row is refused.
 */
export function protectionRequestsFrom(choices: ProtectionChoices, unit: 'C' | 'F', channel: string, specs: readonly ProtectionSpec[]): ProtectionChoiceResult {
  const errors: Partial<Record<Protection, string>> = {};
  const checks: ProtectionRequest[] = [];
  for (const p of PROTECTIONS) {
    const c = choices[p];
    const typed = number(c.threshold);
    const delay = number(c.delay);
    if (!c.on) {
      if (typed !== null || delay !== null) errors[p] = 'Tick the box to check this protection, or clear the value: it is not ignored.';
      continue;
    }
    if ((typed !== null && !Number.isFinite(typed)) || (delay !== null && !(Number.isFinite(delay) && delay >= 0))) {
      errors[p] = 'A number, and a delay of 0 s or more.';
      continue;
    }
    const temperature = PROTECTION_TRAITS[p].signal === 'temperature';
    const fromRecord = specs.some((s) => s.protection === p);
    const thresholdValue = typed !== null ? (temperature && unit === 'F' ? fahrenheitToCelsius(typed) : typed) : fromRecord ? undefined : COMMON_PRACTICE_CELSIUS[p];
    if (thresholdValue === undefined && !fromRecord) {
      errors[p] = "Type the expected threshold: the pack's record states none.";
      continue;
    }
    checks.push({
      protection: p,
      ...(thresholdValue !== undefined ? { thresholdValue } : {}),
      ...(delay !== null ? { delaySeconds: delay } : {}),
      channel: temperature ? channel : null,
    });
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  if (checks.length === 0) return { ok: false, errors: { 'cold-charge': 'Tick at least one protection to check.' } };
  return { ok: true, checks };
}
