import { MeterAccuracySchema, type MeterAccuracy } from '../../../../shared/schemas/meter-accuracy';
import { TextField } from '../../../components/ui/field';

/** The form's text for each term of the meter's stated accuracy, keyed as in MeterAccuracySchema. */
export type AccuracyFields = Record<keyof MeterAccuracy, string>;

const KEYS = ['voltsGainPercent', 'voltsOffsetVolts', 'ampsGainPercent', 'ampsOffsetAmps'] as const;

/** The bench's stored accuracy as form text (empty when none is stated). */
export function initialAccuracyFields(stored: MeterAccuracy | null | undefined): AccuracyFields {
  return Object.fromEntries(KEYS.map((k) => [k, stored ? String(stored[k]) : ''])) as AccuracyFields;
}

/** All four empty: not stated (null); all four filled and valid: the accuracy; otherwise an error to show. */
export function accuracyFromFields(f: AccuracyFields): { accuracy: MeterAccuracy | null; error?: string } {
  const filled = KEYS.filter((k) => f[k].trim() !== '');
  if (filled.length === 0) return { accuracy: null };
  const parsed = MeterAccuracySchema.safeParse(Object.fromEntries(KEYS.map((k) => [k, f[k].trim() === '' ? Number.NaN : Number(f[k])])));
  if (!parsed.success) return { accuracy: null, error: 'Meter accuracy: give all four terms from the data sheet as numbers of 0 or more (gain in % of reading), or leave all four empty.' };
  return { accuracy: parsed.data };
}

/** The meter's stated accuracy ±(% of reading + offset) for volts and amps, typed from its data sheet. */
export function MeterAccuracyFields({ value, onChange }: { value: AccuracyFields; onChange: (next: AccuracyFields) => void }) {
  const set = (name: keyof AccuracyFields) => (e: { target: { value: string } }) => onChange({ ...value, [name]: e.target.value });
  return (
    <fieldset className="grid gap-4 md:grid-cols-4">
      <legend className="mb-2 text-sm text-ink-muted">
        Meter accuracy from its data sheet, ±(% of reading + offset). Gives the uncertainty of the delivered Ah and Wh (JCGM 100, k = 2); a verdict
        inside it reads Borderline. Leave empty when not known.
      </legend>
      <TextField label="Volts gain (% of reading)" inputMode="decimal" value={value.voltsGainPercent} onChange={set('voltsGainPercent')} placeholder="0.1" />
      <TextField label="Volts offset (V)" inputMode="decimal" value={value.voltsOffsetVolts} onChange={set('voltsOffsetVolts')} placeholder="0.01" />
      <TextField label="Amps gain (% of reading)" inputMode="decimal" value={value.ampsGainPercent} onChange={set('ampsGainPercent')} placeholder="0.2" />
      <TextField label="Amps offset (A)" inputMode="decimal" value={value.ampsOffsetAmps} onChange={set('ampsOffsetAmps')} placeholder="0.02" />
    </fieldset>
  );
}
