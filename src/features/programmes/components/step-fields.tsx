import { useFieldArray, useFormContext, useWatch, type Path } from 'react-hook-form';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { blankStep, type ProgrammeFormValues, type StepFormValues } from './programme-form-values';

type FormPath = Path<ProgrammeFormValues>;

const KIND_OPTIONS = [
  { value: 'charge', label: 'Charge (CC-CV)' },
  { value: 'rest', label: 'Rest' },
  { value: 'discharge', label: 'Discharge' },
  { value: 'wait-temp', label: 'Wait for a temperature' },
] as const;
const MODE_OPTIONS = [
  { value: 'cc', label: 'Constant current (A)' },
  { value: 'cp', label: 'Constant power (W)' },
  { value: 'cr', label: 'Constant resistance (Ω)' },
] as const;
const DIRECTION_OPTIONS = [
  { value: 'below', label: 'at or below' },
  { value: 'above', label: 'at or above' },
] as const;

/** A number input for one field of a step; its error comes from the server's or the schema's message for that path. */
function NumberField({ at, label, errors, hint }: { at: string; label: string; errors: Record<string, string>; hint?: string }) {
  const { register } = useFormContext<ProgrammeFormValues>();
  return <TextField label={label} type="number" step="any" hint={hint} error={errors[at]} {...register(at as FormPath, { valueAsNumber: true })} />;
}

/** The fields of one step, by its kind. `at` is its path in the form (`steps.2`, `steps.1.steps.0`). */
export function StepFields({ at, errors, nested = false }: { at: string; errors: Record<string, string>; nested?: boolean }) {
  const { register, control } = useFormContext<ProgrammeFormValues>();
  const kind = useWatch({ control, name: `${at}.kind` as FormPath }) as StepFormValues['kind'];
  const kinds = nested ? KIND_OPTIONS : [...KIND_OPTIONS, { value: 'repeat', label: 'Repeat a block' }];
  return (
    <div className="grid gap-3 md:grid-cols-3">
      <SelectField label="Step" options={kinds} {...register(`${at}.kind` as FormPath)} />
      {kind === 'charge' && (
        <>
          <NumberField at={`${at}.volts`} label="Charge to, V (pack)" errors={errors} />
          <NumberField at={`${at}.currentAmps`} label="Charge current, A" errors={errors} />
          <NumberField at={`${at}.taperAmps`} label="End at taper current, A" errors={errors} />
          <NumberField at={`${at}.maxSeconds`} label="Or end after, s" errors={errors} />
        </>
      )}
      {kind === 'rest' && (
        <>
          <NumberField at={`${at}.maxSeconds`} label="Rest for, s (longest)" errors={errors} />
          <NumberField at={`${at}.settleVoltsPerMinute`} label="Or until it moves less than, V/min" errors={errors} />
        </>
      )}
      {kind === 'discharge' && (
        <>
          <SelectField label="Mode" options={MODE_OPTIONS} {...register(`${at}.mode` as FormPath)} />
          <NumberField at={`${at}.value`} label="Set value (A, W or Ω)" errors={errors} />
          <NumberField at={`${at}.endVolts`} label="End voltage, V (pack)" errors={errors} />
          <NumberField at={`${at}.targetAh`} label="Or stop at, Ah" errors={errors} />
          <NumberField at={`${at}.targetWh`} label="Or stop at, Wh" errors={errors} />
        </>
      )}
      {kind === 'wait-temp' && (
        <>
          <SelectField label="Wait until every channel is" options={DIRECTION_OPTIONS} {...register(`${at}.direction` as FormPath)} />
          <NumberField at={`${at}.targetCelsius`} label="Temperature, °C" errors={errors} />
          <NumberField at={`${at}.maxSeconds`} label="Give up after, s" errors={errors} />
        </>
      )}
      {kind === 'repeat' && (
        <>
          <NumberField at={`${at}.times`} label="Times" errors={errors} />
          <BlockSteps at={`${at}.steps`} errors={errors} />
        </>
      )}
    </div>
  );
}

/** The steps of a repeat block, one level deep. */
function BlockSteps({ at, errors }: { at: string; errors: Record<string, string> }) {
  const { control } = useFormContext<ProgrammeFormValues>();
  const { fields, append, remove } = useFieldArray({ control, name: at as 'steps' });
  return (
    <ol className="flex flex-col gap-3 border-l-4 border-line pl-3 md:col-span-3" aria-label="Steps of the block">
      {fields.map((field, j) => (
        <li key={field.id} className="flex flex-col gap-2">
          <StepFields at={`${at}.${j}`} errors={errors} nested />
          <Button variant="ghost" onClick={() => remove(j)} disabled={fields.length === 1}>
            Remove this step of the block
          </Button>
        </li>
      ))}
      <Button variant="secondary" onClick={() => append(blankStep('rest'))}>
        Add a step to the block
      </Button>
    </ol>
  );
}
