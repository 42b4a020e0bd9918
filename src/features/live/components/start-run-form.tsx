import { useForm } from 'react-hook-form';
import type { StartRunRequest } from '../../../../shared/schemas/api-runs';
import type { RunKind, StopWhen } from '../../../../shared/schemas/run';
import { DEFAULT_END_VOLTS_PER_CELL } from '../../../../shared/schemas/lab-settings';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { Loading } from '../../../components/ui/status';
import { ApiError } from '../../../lib/api-client';
import { useLabSettings } from '../../../lib/lab-settings';
import { useBatteryOptions } from '../api/get-battery-options';
import { useStartRun } from '../api/start-run';
import { contextualCautions } from './contextual-cautions';
import { useState } from 'react';
import type { Protection } from '../../../../shared/schemas/protection-check';
import { emptyChoices, protectionRequestsFrom, type ProtectionChoices } from './protection-presets';
import { ProtectionChecksFieldset } from './protection-checks-fieldset';

interface Values {
  batteryId: string;
  name: string;
  kind: RunKind;
  endVoltsPerCell: string;
  acceptancePercent: string;
  stopWhen: StopWhen;
  target: string;
  checks: ProtectionChoices;
}

/** Channel the protections watch when the bench has not said which it has. */
const DEFAULT_TEMP_CHANNEL = 'cell';

const KIND_OPTIONS = [
  { value: 'capacity-discharge', label: 'Capacity discharge' },
  { value: 'charge', label: 'Charge' },
  { value: 'protection-check', label: 'Protection check' },
  { value: 'custom', label: 'Custom' },
] as const;

const STOP_OPTIONS = [
  { value: 'after-recovery', label: 'After cutoff and recovery' },
  { value: 'target-ah', label: 'At a target Ah' },
  { value: 'target-wh', label: 'At a target Wh' },
  { value: 'manual', label: 'By hand' },
] as const;

/** Arms a run on a bench: pack, kind, end voltage, acceptance and when to stop. */
export function StartRunForm({ benchId, onStarted, packCelsius = null, tempChannel = null }: { benchId: number; onStarted: (runId: number) => void; packCelsius?: number | null; tempChannel?: string | null }) {
  const batteries = useBatteryOptions(true);
  const settings = useLabSettings();
  const start = useStartRun();
  const unit = settings.temperatureUnit;
  const [checkErrors, setCheckErrors] = useState<Partial<Record<Protection, string>>>({});
  const { register, handleSubmit, watch, formState: { errors } } = useForm<Values>({
    defaultValues: { batteryId: '', name: '', kind: 'capacity-discharge', endVoltsPerCell: '', acceptancePercent: String(settings.acceptancePercent), stopWhen: 'after-recovery', target: '', checks: emptyChoices() },
  });
  const stopWhen = watch('stopWhen');
  const kind = watch('kind');
  const batteryId = Number(watch('batteryId'));
  const battery = batteries.data?.find((b) => b.id === batteryId);
  const defaultEnd = battery ? settings.endVoltsPerCell[battery.chemistry] ?? DEFAULT_END_VOLTS_PER_CELL[battery.chemistry] : null;

  if (batteries.isPending) return <Loading label="Loading battery packs…" />;
  const options = [{ value: '', label: 'Choose a registered pack' }, ...(batteries.data ?? []).map((b) => ({ value: String(b.id), label: `${b.label} · ${b.brand} · ${b.cellsInSeries}S ${b.ratedAh} Ah` }))];

  const onSubmit = handleSubmit((v) => {
    let protectionChecks: StartRunRequest['protectionChecks'] = [];
    if (v.kind === 'protection-check') {
      const chosen = protectionRequestsFrom(v.checks, unit, tempChannel ?? DEFAULT_TEMP_CHANNEL, battery?.protectionSpecs ?? []);
      setCheckErrors(chosen.ok ? {} : chosen.errors);
      if (!chosen.ok) return;
      protectionChecks = chosen.checks;
    }
    const perCell = v.endVoltsPerCell ? Number(v.endVoltsPerCell) : defaultEnd;
    const target = v.target ? Number(v.target) : null;
    const body: StartRunRequest = {
      benchId,
      batteryId: Number(v.batteryId),
      name: v.name.trim(),
      kind: v.kind,
      endVolts: perCell ? { mode: 'per-cell', voltsPerCell: perCell } : null,
      acceptancePercent: Number(v.acceptancePercent),
      stopWhen: v.stopWhen,
      targetAh: v.stopWhen === 'target-ah' ? target : null,
      targetWh: v.stopWhen === 'target-wh' ? target : null,
      protectionChecks,
    };
    start.mutate(body, { onSuccess: (run) => onStarted(run.id) });
  });

  const serverFields = start.error instanceof ApiError ? start.error.fields : {};
  return (
    <div className="flex flex-col gap-4">
      <SafetyCautions />
      <form onSubmit={onSubmit} noValidate className="grid gap-4 md:grid-cols-2" aria-label="Start a run">
        <SelectField label="Battery pack" options={options} error={errors.batteryId?.message ?? serverFields.batteryId} {...register('batteryId', { required: 'Choose the pack on the bench.' })} />
        <TextField label="Run name" placeholder="Voltara 24 V 100 Ah, 0.2 C capacity" error={errors.name?.message ?? serverFields.name} {...register('name', { required: 'Give the run a name you can search for later.' })} />
        <SelectField label="Kind of test" options={KIND_OPTIONS} {...register('kind')} />
        <TextField
          label="End voltage per cell (V)"
          inputMode="decimal"
          placeholder={defaultEnd ? `${defaultEnd} (lab default)` : 'Lab default for the chemistry'}
          hint={battery && defaultEnd ? `${battery.cellsInSeries} cells → ${(defaultEnd * battery.cellsInSeries).toFixed(2)} V for the pack at the default` : undefined}
          error={errors.endVoltsPerCell?.message}
          {...register('endVoltsPerCell', { validate: (v) => !v || (Number(v) > 0 && Number(v) < 5) || 'Between 0 and 5 V per cell.' })}
        />
        <TextField label="Acceptance (% of rated)" inputMode="decimal" error={errors.acceptancePercent?.message} {...register('acceptancePercent', { validate: (v) => (Number(v) > 0 && Number(v) <= 1000) || 'A percentage above 0.' })} />
        <SelectField label="Stop" options={STOP_OPTIONS} {...register('stopWhen')} />
        {(stopWhen === 'target-ah' || stopWhen === 'target-wh') && (
          <TextField
            label={stopWhen === 'target-ah' ? 'Target (Ah)' : 'Target (Wh)'}
            inputMode="decimal"
            error={errors.target?.message ?? serverFields.targetAh ?? serverFields.targetWh}
            {...register('target', { validate: (v) => Number(v) > 0 || 'Enter the target.' })}
          />
        )}
        {kind === 'protection-check' && (
          <ProtectionChecksFieldset
            // The fieldset registers only the `checks.*` fields of this form.
            register={register as unknown as Parameters<typeof ProtectionChecksFieldset>[0]['register']}
            errors={checkErrors}
            unit={unit}
            channel={tempChannel ?? DEFAULT_TEMP_CHANNEL}
            specs={battery?.protectionSpecs ?? []}
          />
        )}
        {battery &&
          contextualCautions(battery.chemistry, kind, packCelsius, settings.temperatureUnit).map((c) => (
            <p
              key={c.text}
              role={c.severe ? 'alert' : undefined}
              className={`rounded-lg p-3 text-sm md:col-span-2 ${c.severe ? 'bg-state-cutoff font-bold text-on-tone' : 'border border-caution/50 bg-caution-surface text-ink'}`}
            >
              {c.text}
            </p>
          ))}
        {start.isError && (
          <p role="alert" className="text-sm font-medium text-state-cutoff md:col-span-2">
            {start.error instanceof Error ? start.error.message : 'The run did not start.'}
          </p>
        )}
        <div className="md:col-span-2">
          <Button type="submit" size="lg" disabled={start.isPending}>
            Arm the run
          </Button>
          <span className="ml-3 text-sm text-ink-muted">Recording starts with the first reading; switch the load on after arming.</span>
        </div>
      </form>
    </div>
  );
}
