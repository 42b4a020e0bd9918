import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { InstrumentInputSchema, type Instrument, type InstrumentInput } from '../../../../shared/schemas/instrument';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { benchesQueryOptions } from '../../../lib/queries/benches';
import { useSaveInstrument } from '../api/instruments';

const KIND_OPTIONS = [
  { value: 'meter', label: 'Meter' },
  { value: 'load', label: 'Electronic load' },
  { value: 'supply', label: 'Supply or charger' },
] as const;

interface ChannelRow {
  channel: string;
  gain: string;
  offset: string;
}

/** The first error message of each field path ("channels.volts.gain" → "channels"). */
function fieldErrors(issues: { path: PropertyKey[]; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) out[String(issue.path[0] ?? 'form')] ??= `${issue.path.slice(1).join(' ')} ${issue.message}`.trim();
  return out;
}

/** Creates or edits an instrument record: identity, calibration dates, bench, per-channel gain and offset. */
export function InstrumentForm({ instrument, onDone }: { instrument: Instrument | null; onDone: () => void }) {
  const save = useSaveInstrument();
  const benches = useQuery(benchesQueryOptions());
  const [form, setForm] = useState({
    kind: instrument?.kind ?? 'meter',
    make: instrument?.make ?? '',
    model: instrument?.model ?? '',
    serialNumber: instrument?.serialNumber ?? '',
    calibratedOn: instrument?.calibratedOn ?? '',
    calibrationDueOn: instrument?.calibrationDueOn ?? '',
    benchId: instrument?.benchId === null || instrument === null ? '' : String(instrument.benchId),
    notes: instrument?.notes ?? '',
  });
  const [channels, setChannels] = useState<ChannelRow[]>(
    Object.entries(instrument?.channels ?? {}).map(([channel, c]) => ({ channel, gain: String(c.gain), offset: String(c.offset) })),
  );
  const [errors, setErrors] = useState<Record<string, string>>({});
  const server = save.error instanceof ApiError ? save.error.fields : {};
  const set = (name: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [name]: e.target.value });
  const setChannel = (index: number, name: keyof ChannelRow, value: string) =>
    setChannels(channels.map((row, i) => (i === index ? { ...row, [name]: value } : row)));

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = InstrumentInputSchema.safeParse({
      ...form,
      calibratedOn: form.calibratedOn || null,
      calibrationDueOn: form.calibrationDueOn || null,
      benchId: form.benchId === '' ? null : Number(form.benchId),
      channels: Object.fromEntries(channels.map((c) => [c.channel.trim(), { gain: Number(c.gain), offset: Number(c.offset) }])),
    });
    if (!parsed.success) return setErrors(fieldErrors(parsed.error.issues));
    setErrors({});
    save.mutate({ id: instrument?.id ?? null, input: parsed.data satisfies InstrumentInput }, { onSuccess: onDone });
  };
  const error = (name: string) => errors[name] ?? server[name];
  const benchOptions = [{ value: '', label: 'On the shelf (no bench)' }, ...(benches.data ?? []).map((b) => ({ value: String(b.id), label: b.name }))];

  return (
    <form onSubmit={onSubmit} noValidate aria-label={instrument ? `Edit ${instrument.make} ${instrument.model}` : 'Add an instrument'} className="grid gap-4 md:grid-cols-2">
      <SelectField label="Kind" options={KIND_OPTIONS} value={form.kind} onChange={set('kind')} />
      <SelectField label="Bench" options={benchOptions} value={form.benchId} onChange={set('benchId')} error={error('benchId')} />
      <TextField label="Make" value={form.make} onChange={set('make')} error={error('make')} />
      <TextField label="Model" value={form.model} onChange={set('model')} error={error('model')} />
      <TextField label="Serial number" value={form.serialNumber} onChange={set('serialNumber')} error={error('serialNumber')} />
      <div />
      <TextField label="Calibrated on" type="date" value={form.calibratedOn} onChange={set('calibratedOn')} error={error('calibratedOn')} />
      <TextField label="Calibration due" type="date" value={form.calibrationDueOn} onChange={set('calibrationDueOn')} error={error('calibrationDueOn')} />
      <fieldset className="md:col-span-2">
        <legend className="text-sm font-medium text-ink-muted">Corrections from the certificate: corrected = reading × gain + offset</legend>
        <p className="text-xs text-ink-faint">Channels: volts, amps, or temp:name (for example temp:cell). A meter's corrections apply to its bench's readings as they arrive; the raw values are kept.</p>
        {channels.map((row, i) => (
          <div key={i} className="mt-2 grid grid-cols-[1fr_1fr_1fr_auto] items-end gap-2">
            <TextField label={`Channel ${i + 1}`} value={row.channel} onChange={(e) => setChannel(i, 'channel', e.target.value)} />
            <TextField label={`Gain ${i + 1}`} inputMode="decimal" value={row.gain} onChange={(e) => setChannel(i, 'gain', e.target.value)} />
            <TextField label={`Offset ${i + 1}`} inputMode="decimal" value={row.offset} onChange={(e) => setChannel(i, 'offset', e.target.value)} />
            <Button variant="ghost" onClick={() => setChannels(channels.filter((_, j) => j !== i))}>
              Remove
            </Button>
          </div>
        ))}
        {error('channels') && (
          <p role="alert" className="mt-1 text-sm font-medium text-state-cutoff">
            Corrections: {error('channels')}
          </p>
        )}
        <Button variant="secondary" className="mt-2" onClick={() => setChannels([...channels, { channel: channels.length === 0 ? 'volts' : 'amps', gain: '1', offset: '0' }])}>
          Add channel
        </Button>
      </fieldset>
      <TextField label="Notes" value={form.notes} onChange={set('notes')} error={error('notes')} className="md:col-span-2" />
      {save.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff md:col-span-2">
          {save.error instanceof Error ? save.error.message : 'The record was not saved.'}
        </p>
      )}
      <div className="flex gap-2 md:col-span-2">
        <Button type="submit" disabled={save.isPending}>
          {instrument ? 'Save changes' : 'Add instrument'}
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
