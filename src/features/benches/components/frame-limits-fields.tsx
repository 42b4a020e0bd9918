import { FrameLimitsSchema, type BenchSourceConfig } from '../../../../shared/schemas/bench';
import { TextField } from '../../../components/ui/field';

/** The form's text for each bound, keyed as in FrameLimitsSchema. */
export type LimitFields = Record<'maxAbsVolts' | 'maxAbsAmps' | 'minTempCelsius' | 'maxTempCelsius', string>;

/** The bench's stored bounds as form text (the defaults for a new bench or a source without any). */
export function initialLimitFields(source?: BenchSourceConfig): LimitFields {
  // A source stored before benches had bounds comes back without them: show the defaults.
  const stored: unknown = source && source.kind !== 'none' ? source.limits : undefined;
  const limits = FrameLimitsSchema.parse(stored ?? {});
  return {
    maxAbsVolts: String(limits.maxAbsVolts),
    maxAbsAmps: String(limits.maxAbsAmps),
    minTempCelsius: String(limits.minTempCelsius),
    maxTempCelsius: String(limits.maxTempCelsius),
  };
}

/** The form's text as numbers for the source config (the shared schema checks them). */
export function limitsFromFields(f: LimitFields): Record<keyof LimitFields, number> {
  return { maxAbsVolts: Number(f.maxAbsVolts), maxAbsAmps: Number(f.maxAbsAmps), minTempCelsius: Number(f.minTempCelsius), maxTempCelsius: Number(f.maxTempCelsius) };
}

/** Physical bounds of the bench's meter: readings outside them are counted as bad frames, never recorded. */
export function FrameLimitsFields({ value, onChange }: { value: LimitFields; onChange: (next: LimitFields) => void }) {
  const set = (name: keyof LimitFields) => (e: { target: { value: string } }) => onChange({ ...value, [name]: e.target.value });
  return (
    <fieldset className="grid gap-4 md:grid-cols-4">
      <legend className="mb-2 text-sm text-ink-muted">Physical bounds: a reading outside them is counted as a bad frame with its reason and never enters a run.</legend>
      <TextField label="Largest |voltage| (V)" inputMode="decimal" value={value.maxAbsVolts} onChange={set('maxAbsVolts')} />
      <TextField label="Largest |current| (A)" inputMode="decimal" value={value.maxAbsAmps} onChange={set('maxAbsAmps')} />
      <TextField label="Lowest temperature (°C)" inputMode="decimal" value={value.minTempCelsius} onChange={set('minTempCelsius')} />
      <TextField label="Highest temperature (°C)" inputMode="decimal" value={value.maxTempCelsius} onChange={set('maxTempCelsius')} />
    </fieldset>
  );
}
