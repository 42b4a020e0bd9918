import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { CHEMISTRIES } from '../../../../shared/schemas/battery';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';
import type { LabSettings } from '../../../../shared/schemas/lab-settings';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { SelectField, TextField } from '../../../components/ui/field';
import { Loading, QueryError } from '../../../components/ui/status';
import { ApiError } from '../../../lib/api-client';
import { labSettingsQueryOptions } from '../../../lib/lab-settings';
import { useUpdateSettings } from '../api/update-settings';

const MAX_END_VOLTS_PER_CELL = 5;

function Form({ initial }: { initial: LabSettings }) {
  const update = useUpdateSettings();
  const { register, handleSubmit, reset, formState: { errors, isDirty } } = useForm<LabSettings>({ defaultValues: initial });
  // The server names the fields it refused; each message goes beside its field.
  const server = update.error instanceof ApiError ? update.error.fields : {};
  const onSubmit = handleSubmit((v) =>
    update.mutate(
      {
        ...v,
        acceptancePercent: Number(v.acceptancePercent),
        endVoltsPerCell: Object.fromEntries(CHEMISTRIES.map((c) => [c, Number(v.endVoltsPerCell[c])])) as LabSettings['endVoltsPerCell'],
      },
      // The saved document becomes the form's new baseline, so "Saved." shows until the next edit.
      { onSuccess: (saved) => reset(saved) },
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Lab settings" className="flex flex-col gap-6">
      <Card className="grid gap-4 p-6 md:grid-cols-2">
        <TextField label="Lab name" error={errors.labName?.message ?? server.labName} {...register('labName', { required: 'The lab needs a name.' })} />
        <TextField
          label="Time zone"
          placeholder="Europe/Berlin"
          hint="A region and city, such as Europe/Berlin or America/Chicago; every time on screen and in reports uses it."
          error={errors.timeZone?.message ?? (server.timeZone ? `Not a time zone Kneepoint knows (${server.timeZone}). Use a region/city name such as Europe/Berlin.` : undefined)}
          {...register('timeZone', { required: 'Enter the lab’s time zone, such as Europe/Berlin.' })}
        />
        <SelectField label="Temperature unit" options={[{ value: 'C', label: '°C' }, { value: 'F', label: '°F' }]} {...register('temperatureUnit')} />
        <SelectField label="Energy unit" options={[{ value: 'Wh', label: 'Wh' }, { value: 'kWh', label: 'kWh' }]} {...register('energyUnit')} />
        <TextField
          label="Currency"
          placeholder="EUR"
          hint="Three-letter code (ISO 4217) for prices; a pack registered with its own currency keeps it."
          error={errors.currency?.message ?? server.currency}
          {...register('currency', { setValueAs: (v: string) => v.trim().toUpperCase(), validate: (v) => /^[A-Z]{3}$/.test(v) || 'A three-letter code such as EUR or USD.' })}
        />
        <TextField
          label="Acceptance (% of rated)"
          inputMode="decimal"
          error={errors.acceptancePercent?.message ?? server.acceptancePercent}
          {...register('acceptancePercent', { validate: (v) => (Number(v) >= 1 && Number(v) <= 100) || 'Between 1 and 100 %.' })}
        />
      </Card>
      <Card className="p-6">
        <h2 className="mb-1 font-semibold">Default end voltage per cell (V)</h2>
        <p className="mb-4 text-sm text-ink-muted">Used when a run does not set its own. Check the cell maker's datasheet.</p>
        <div className="grid gap-4 md:grid-cols-4">
          {CHEMISTRIES.map((c) => (
            <TextField
              key={c}
              label={CHEMISTRY_LABEL[c]}
              inputMode="decimal"
              error={errors.endVoltsPerCell?.[c]?.message ?? server[`endVoltsPerCell.${c}`]}
              {...register(`endVoltsPerCell.${c}`, { validate: (v) => (Number(v) > 0 && Number(v) <= MAX_END_VOLTS_PER_CELL) || `Between 0 and ${MAX_END_VOLTS_PER_CELL} V.` })}
            />
          ))}
        </div>
      </Card>
      {update.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff">
          {update.error instanceof Error ? update.error.message : 'Settings were not saved.'}
        </p>
      )}
      {update.isSuccess && !isDirty && <p role="status" className="text-sm text-state-recording">Saved.</p>}
      <div>
        <Button type="submit" disabled={update.isPending}>
          Save settings
        </Button>
      </div>
    </form>
  );
}

/** Lab-wide defaults (admin): units, time zone, acceptance and end voltages. */
export function SettingsForm() {
  const settings = useQuery(labSettingsQueryOptions());
  if (settings.isPending) return <Loading />;
  if (settings.isError) return <QueryError error={settings.error} what="Lab settings" />;
  return <Form initial={settings.data} />;
}
