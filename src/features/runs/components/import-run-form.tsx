import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { useLabSettings } from '../../../lib/lab-settings';
import { formatCharge, formatDuration, formatEnergy } from '../../../lib/units';
import { useBatteryChoices } from '../api/get-batteries';
import { ApiError } from '../../../lib/api-client';
import { useImportRun, type ImportRunInput } from '../api/import-run';
import { ImportProgressBars } from './import-progress-bars';
import { ImportOptionsFields, importOptionsError, importOptionsInput, type ImportOptions } from './import-options-fields';

/** The columns a log must have (temperature is optional), as the mapping names them. */
const COLUMN_FIELDS = [
  { key: 'time', label: 'Time column' },
  { key: 'volts', label: 'Volts column' },
  { key: 'amps', label: 'Amps column' },
  { key: 'temp', label: 'Temperature column (optional)' },
] as const;
type ColumnKey = (typeof COLUMN_FIELDS)[number]['key'];

/** The header names typed in, without the empty ones. */
function columnMap(columns: Record<ColumnKey, string>): ImportRunInput['columns'] {
  return Object.fromEntries(Object.entries(columns).map(([k, v]) => [k, v.trim()]).filter(([, v]) => v !== ''));
}

/** Turns a CSV log from another logger into a run (technicians). */
export function ImportRunForm({ onDone }: { onDone: () => void }) {
  const batteries = useBatteryChoices(true);
  const importRun = useImportRun();
  const { energyUnit, temperatureUnit, acceptancePercent } = useLabSettings();
  const navigate = useNavigate();
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState('');
  const [batteryId, setBatteryId] = useState('');
  const [endVolts, setEndVolts] = useState('');
  const [typed, setOptions] = useState<Omit<ImportOptions, 'acceptancePercent'> & { acceptancePercent: string | null }>({
    currentSign: 'auto', timeFormat: '', tempUnit: '', acceptancePercent: null, electrolyteTempCelsius: '', maxGapSeconds: '',
  });
  // The acceptance shows the lab's setting (once loaded) until someone types over it; the rest start at "work it out".
  const options: ImportOptions = { ...typed, acceptancePercent: typed.acceptancePercent ?? String(acceptancePercent) };
  const [error, setError] = useState<string | null>(null);
  const [columns, setColumns] = useState<Record<ColumnKey, string>>({ time: '', volts: '', amps: '', temp: '' });

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!file) return setError('Choose a CSV file.');
    if (!name.trim()) return setError('Give the run a name.');
    if (endVolts && !(Number(endVolts) > 0)) return setError('The end voltage must be a number above 0 V.');
    const optionsError = importOptionsError(options);
    if (optionsError) return setError(optionsError);
    setError(null);
    const input: ImportRunInput = {
      file, name: name.trim(), batteryId: batteryId ? Number(batteryId) : undefined, endVolts: endVolts ? Number(endVolts) : undefined, columns: columnMap(columns),
      ...importOptionsInput(options),
    };
    // The importer's decisions (time format, sign, units, duplicate times) travel to the run page.
    importRun.mutate(input, { onSuccess: (r) => navigate(`/runs/${r.run.id}`, { state: { importNotices: r.summary.notices ?? [] } }) });
  };

  const message = error ?? (importRun.error instanceof Error ? importRun.error.message : null);
  // The server names the column it could not find: open the mapping so it can be given.
  const columnTrouble = !!message && /column/i.test(message);
  const fieldErrors = !error && importRun.error instanceof ApiError ? importRun.error.fields : {};
  const leadAcid = (batteries.data ?? []).some((b) => String(b.id) === batteryId && b.chemistry === 'lead-acid');
  return (
    <form onSubmit={submit} noValidate aria-label="Import a logged run" className="grid gap-4 md:grid-cols-2">
      <div className="flex flex-col gap-1">
        <label htmlFor="import-file" className="text-sm font-medium text-ink-muted">
          CSV file (header row: time, volts, amps, temperature)
        </label>
        <input
          id="import-file"
          type="file"
          accept=".csv,text/csv"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          className="min-h-11 rounded-lg border border-line bg-surface-sunken p-2 text-ink"
        />
      </div>
      <TextField label="Run name" value={name} onChange={(e) => setName(e.target.value)} placeholder="Hollis standby 12 V, 2025 acceptance log" />
      <SelectField
        label="Battery pack (optional)"
        value={batteryId}
        onChange={(e) => setBatteryId(e.target.value)}
        options={[{ value: '', label: 'Not linked to a pack' }, ...(batteries.data ?? []).map((b) => ({ value: String(b.id), label: `${b.label} · ${b.brand}` }))]}
      />
      <TextField label="End voltage of the pack (V, optional)" inputMode="decimal" value={endVolts} onChange={(e) => setEndVolts(e.target.value)} />
      <ImportOptionsFields value={options} onChange={setOptions} labTempUnit={temperatureUnit} leadAcid={leadAcid} errors={fieldErrors} />
      <details open={columnTrouble || undefined} className="rounded-lg border border-line p-3 md:col-span-2">
        <summary className="cursor-pointer text-sm font-medium">Columns named differently?</summary>
        <p className="mt-2 text-sm text-ink-muted">
          Kneepoint recognises common names (time, elapsed, voltage, current, temperature, with or without units such as
          &quot;Voltage (V)&quot;). Otherwise type the header of each column exactly as it is in the file.
        </p>
        <div className="mt-3 grid gap-3 md:grid-cols-4">
          {COLUMN_FIELDS.map((c) => (
            <TextField key={c.key} label={c.label} value={columns[c.key]} onChange={(e) => setColumns({ ...columns, [c.key]: e.target.value })} />
          ))}
        </div>
      </details>
      {message && (
        <p role="alert" className="text-sm font-medium text-state-cutoff md:col-span-2">
          {message}
        </p>
      )}
      {importRun.isPending && importRun.progress && file && <ImportProgressBars progress={importRun.progress} fileName={file.name} />}
      {importRun.data && (
        <p role="status" className="num text-sm md:col-span-2">
          {formatEnergy(importRun.data.summary.energyWh, energyUnit)} · {formatCharge(importRun.data.summary.dischargeAh)} · {formatDuration(importRun.data.summary.durationSeconds)}
        </p>
      )}
      <div className="flex gap-2 md:col-span-2">
        <Button type="submit" disabled={importRun.isPending}>
          {importRun.isPending ? 'Importing…' : 'Import'}
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
