import type { UseFormRegister } from 'react-hook-form';
import { PROTECTIONS, PROTECTION_TRAITS, type Protection, type ProtectionSpec } from '../../../../shared/schemas/protection-check';
import { TextField } from '../../../components/ui/field';
import { celsiusToFahrenheit } from '../../../lib/units';
import { COMMON_PRACTICE_CELSIUS, type ProtectionChoices } from './protection-presets';

/** A °C value in the lab's unit, for a placeholder. */
function inUnit(celsius: number, unit: 'C' | 'F'): string {
  return String(unit === 'F' ? Math.round(celsiusToFahrenheit(celsius) * 10) / 10 : celsius);
}

function placeholderFor(p: Protection, spec: ProtectionSpec | undefined, unit: 'C' | 'F'): string {
  const temperature = PROTECTION_TRAITS[p].signal === 'temperature';
  if (spec) return `${temperature ? inUnit(spec.thresholdValue, unit) : spec.thresholdValue} (pack's record)`;
  const common = COMMON_PRACTICE_CELSIUS[p];
  return common !== undefined ? `${inUnit(common, unit)} (common practice)` : 'from the datasheet';
}

/**
 * The protections a protection check times, one row each: tick it, type the expected threshold
 * (°C or °F as the lab works, pack volts, amps) and delay, or leave them to the pack's record.
 */
export function ProtectionChecksFieldset({ register, errors, unit, channel, specs }: {
  register: UseFormRegister<{ checks: ProtectionChoices }>;
  errors: Partial<Record<Protection, string>>;
  unit: 'C' | 'F';
  channel: string;
  specs: readonly ProtectionSpec[];
}) {
  return (
    <fieldset className="flex flex-col gap-3 rounded-lg border border-line p-4 md:col-span-2">
      <legend className="px-1 text-sm font-semibold">Protections to check (temperatures on the {channel} sensor)</legend>
      <p className="text-sm text-ink-muted">
        Each ticked protection is timed from its threshold to the current stopping and back, and passes within the tolerance shown on the result
        (±2 °C, ±2 % of a voltage or current, ±(1 s + 10 %) of a delay unless the pack's record states its own). A value typed on an unticked row is refused, not ignored.
      </p>
      {PROTECTIONS.map((p) => {
        const traits = PROTECTION_TRAITS[p];
        const shownUnit = traits.unit === '°C' ? `°${unit}` : traits.unit;
        const spec = specs.find((s) => s.protection === p);
        return (
          <div key={p} className="grid gap-3 md:grid-cols-[minmax(14rem,1fr)_1fr_1fr]">
            <label className="flex min-h-11 items-center gap-3">
              <input type="checkbox" className="h-5 w-5" {...register(`checks.${p}.on`)} />
              {traits.label}
            </label>
            <TextField label={`${traits.label}: threshold (${shownUnit})`} inputMode="decimal" placeholder={placeholderFor(p, spec, unit)} error={errors[p]} {...register(`checks.${p}.threshold`)} />
            <TextField
              label={`${traits.label}: delay (s)`}
              inputMode="decimal"
              placeholder={spec?.delaySeconds != null ? `${spec.delaySeconds} (pack's record)` : 'not stated'}
              {...register(`checks.${p}.delay`)}
            />
          </div>
        );
      })}
    </fieldset>
  );
}
