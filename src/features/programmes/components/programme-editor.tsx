import { FormProvider, useFieldArray, useForm } from 'react-hook-form';
import type { Programme } from '../../../../shared/schemas/programme';
import { CHEMISTRIES } from '../../../../shared/schemas/battery';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useSaveProgramme } from '../api/programmes';
import { blankStep, toFormValues, toProgrammeInput, type ProgrammeFormValues } from './programme-form-values';
import { StepFields } from './step-fields';

const CHEMISTRY_OPTIONS = CHEMISTRIES.map((c) => ({ value: c, label: c.toUpperCase() }));

/**
 * Writes or changes a programme: the pack it is for (its floor and ceiling come from the
 * chemistry and cells, its current limit from the protection rating) and its steps. Unsafe
 * values come back from the server with a message beside the field.
 */
export function ProgrammeEditor({ programme, onDone }: { programme: Programme | null; onDone: () => void }) {
  const save = useSaveProgramme();
  const form = useForm<ProgrammeFormValues>({ defaultValues: toFormValues(programme) });
  const { fields, append, remove, move } = useFieldArray({ control: form.control, name: 'steps' });
  const local = form.formState.errors.root?.message;
  const serverFields = save.error instanceof ApiError ? save.error.fields : {};
  const onSubmit = form.handleSubmit((values) => {
    const checked = toProgrammeInput(values);
    if (!checked.success) {
      form.setError('root', { message: checked.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ') });
      return;
    }
    save.mutate({ id: programme?.id ?? null, input: checked.data }, { onSuccess: onDone });
  });
  const reg = form.register;
  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate aria-label={programme ? `Change ${programme.name}` : 'New programme'} className="flex flex-col gap-4">
        <div className="grid gap-3 md:grid-cols-2">
          <TextField label="Name" error={serverFields.name} {...reg('name')} />
          <TextField label="Description" {...reg('description')} />
          <SelectField label="Chemistry" options={CHEMISTRY_OPTIONS} {...reg('chemistry')} />
          <TextField label="Cells in series" type="number" error={serverFields.cellsInSeries} {...reg('cellsInSeries', { valueAsNumber: true })} />
          <TextField label="Pack protection rating, A" type="number" step="any" error={serverFields.maxCurrentAmps} {...reg('maxCurrentAmps', { valueAsNumber: true })} />
        </div>
        <ol className="flex flex-col gap-4" aria-label="Steps">
          {fields.map((field, i) => (
            <li key={field.id} className="flex flex-col gap-2 rounded-lg border border-line p-3">
              <span className="font-semibold">Step {i + 1}</span>
              <StepFields at={`steps.${i}`} errors={serverFields} />
              <div className="flex flex-wrap gap-2">
                <Button variant="ghost" onClick={() => move(i, i - 1)} disabled={i === 0}>
                  Move up
                </Button>
                <Button variant="ghost" onClick={() => remove(i)} disabled={fields.length === 1}>
                  Remove step {i + 1}
                </Button>
              </div>
            </li>
          ))}
        </ol>
        <Button variant="secondary" onClick={() => append(blankStep('rest'))}>
          Add a step
        </Button>
        {(local || save.isError) && (
          <p role="alert" className="text-sm font-medium text-state-cutoff">
            {local ?? save.error?.message}
          </p>
        )}
        <div className="flex gap-2">
          <Button type="submit" disabled={save.isPending}>
            Save programme
          </Button>
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        </div>
      </form>
    </FormProvider>
  );
}
