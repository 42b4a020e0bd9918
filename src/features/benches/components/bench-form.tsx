import { useState, type FormEvent } from 'react';
import { BenchSourceConfigSchema, DEFAULT_STALE_AFTER_S, LoadOnAmpsSchema, MAX_LOAD_ON_AMPS, type BenchWithStatus, type SerialFormat } from '../../../../shared/schemas/bench';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useSaveBench, useSerialPorts } from '../api/manage-bench';
import { FrameLimitsFields, initialLimitFields, limitsFromFields, type LimitFields } from './frame-limits-fields';
import { FORMAT_TEMPLATES, SCENARIO_SUGGESTIONS } from './source-templates';
import { MeterAccuracyFields, accuracyFromFields, initialAccuracyFields } from './meter-accuracy-fields';

type SourceKind = 'simulator' | 'serial' | 'none';
const BAUD_RATES = ['9600', '19200', '38400', '57600', '115200', '230400'] as const;
const DEFAULT_BAUD = '115200';
/** Real time and a fixed seed: the same demo every time. */
const DEFAULT_SIM_SPEED = '1';
const DEFAULT_SIM_SEED = '1';

function initialFormat(bench?: BenchWithStatus): { kind: SerialFormat['kind']; json: string } {
  if (bench?.source.kind === 'serial') return { kind: bench.source.format.kind, json: JSON.stringify(bench.source.format, null, 2) };
  return { kind: 'csv', json: JSON.stringify(FORMAT_TEMPLATES.csv, null, 2) };
}

/** Builds the source config from the form and checks it against the shared schema. */
function buildSource(kind: SourceKind, f: Record<string, string>, formatJson: string, limitFields: LimitFields): { source?: unknown; error?: string } {
  let candidate: unknown = { kind: 'none' };
  const limits = limitsFromFields(limitFields);
  if (kind === 'simulator') candidate = { kind, scenario: f.scenario.trim(), speed: Number(f.speed), seed: Number(f.seed), limits };
  if (kind === 'serial') {
    let format: unknown;
    try {
      format = JSON.parse(formatJson);
    } catch {
      return { error: 'The format is not valid JSON.' };
    }
    candidate = { kind, path: f.path.trim(), baudRate: Number(f.baudRate), staleAfterSeconds: Number(f.staleAfterSeconds), format, limits };
  }
  const parsed = BenchSourceConfigSchema.safeParse(candidate);
  if (!parsed.success) return { error: parsed.error.issues.map((i) => `${i.path.join('.') || 'source'}: ${i.message}`).join('; ') };
  return { source: parsed.data };
}

/** Adds or edits a bench and its meter source (lab managers). */
export function BenchForm({ bench, onSaved }: { bench?: BenchWithStatus; onSaved: (benchId: number) => void }) {
  const save = useSaveBench(bench?.id ?? null);
  const src = bench?.source;
  const [kind, setKind] = useState<SourceKind>(src?.kind ?? 'simulator');
  const [fields, setFields] = useState<Record<string, string>>({
    name: bench?.name ?? '',
    notes: bench?.notes ?? '',
    scenario: src?.kind === 'simulator' ? src.scenario : SCENARIO_SUGGESTIONS[0],
    speed: src?.kind === 'simulator' ? String(src.speed) : DEFAULT_SIM_SPEED,
    seed: src?.kind === 'simulator' ? String(src.seed) : DEFAULT_SIM_SEED,
    path: src?.kind === 'serial' ? src.path : '',
    baudRate: src?.kind === 'serial' ? String(src.baudRate) : DEFAULT_BAUD,
    staleAfterSeconds: src?.kind === 'serial' ? String(src.staleAfterSeconds) : String(DEFAULT_STALE_AFTER_S),
    loadOnAmps: bench?.loadOnAmps == null ? '' : String(bench.loadOnAmps),
  });
  const [format, setFormat] = useState(() => initialFormat(bench));
  const [limits, setLimits] = useState(() => initialLimitFields(src));
  const [accuracy, setAccuracy] = useState(() => initialAccuracyFields(bench?.meterAccuracy));
  const [enabled, setEnabled] = useState(bench?.enabled ?? true);
  const [localError, setLocalError] = useState<string | null>(null);
  const ports = useSerialPorts(kind === 'serial');
  const set = (name: string) => (e: { target: { value: string } }) => setFields((f) => ({ ...f, [name]: e.target.value }));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!fields.name.trim()) return setLocalError('Give the bench a name.');
    const built = buildSource(kind, fields, format.json, limits);
    if (built.error) return setLocalError(built.error);
    const threshold = LoadOnAmpsSchema.safeParse(fields.loadOnAmps.trim() ? Number(fields.loadOnAmps) : null);
    if (!threshold.success) return setLocalError(`Load threshold: a current above 0 and at most ${MAX_LOAD_ON_AMPS} A, or empty for the default.`);
    const meter = accuracyFromFields(accuracy);
    if (meter.error) return setLocalError(meter.error);
    setLocalError(null);
    save.mutate(
      { name: fields.name.trim(), notes: fields.notes, enabled, source: built.source as never, loadOnAmps: threshold.data, meterAccuracy: meter.accuracy },
      { onSuccess: (saved) => onSaved(saved.id) },
    );
  };

  const serverError = save.error instanceof ApiError ? save.error.message : save.error ? 'The bench was not saved.' : null;
  return (
    <form onSubmit={submit} noValidate aria-label="Bench" className="flex flex-col gap-4">
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Name" value={fields.name} onChange={set('name')} placeholder="Bench C: 48 V rack packs" />
        <SelectField
          label="Meter source"
          value={kind}
          onChange={(e) => setKind(e.target.value as SourceKind)}
          options={[
            { value: 'simulator', label: 'Simulator (no hardware)' },
            { value: 'serial', label: 'Serial meter (CSV, JSON lines, SCPI, Modbus RTU)' },
            { value: 'none', label: 'None yet' },
          ]}
        />
      </div>
      {kind === 'simulator' && (
        <div className="grid gap-4 md:grid-cols-3">
          <TextField label="Scenario" list="kp-scenarios" value={fields.scenario} onChange={set('scenario')} />
          <datalist id="kp-scenarios">
            {SCENARIO_SUGGESTIONS.map((s) => (
              <option key={s} value={s} />
            ))}
          </datalist>
          <TextField label="Speed (× real time)" inputMode="decimal" value={fields.speed} onChange={set('speed')} />
          <TextField label="Seed" inputMode="numeric" value={fields.seed} onChange={set('seed')} />
        </div>
      )}
      {kind === 'serial' && (
        <div className="grid gap-4 md:grid-cols-3">
          <TextField
            label="Device path"
            list="kp-ports"
            value={fields.path}
            onChange={set('path')}
            placeholder="/dev/ttyUSB0"
            hint={ports.data?.message ?? (ports.data ? `${ports.data.ports.length} port(s) found` : undefined)}
          />
          <datalist id="kp-ports">
            {ports.data?.ports.map((p) => (
              <option key={p.path} value={p.path}>
                {p.manufacturer ?? ''}
              </option>
            ))}
          </datalist>
          <SelectField label="Baud rate" value={fields.baudRate} onChange={set('baudRate')} options={BAUD_RATES.map((b) => ({ value: b, label: `${b} baud` }))} />
          <TextField label="No data after (s)" inputMode="decimal" value={fields.staleAfterSeconds} onChange={set('staleAfterSeconds')} />
          <SelectField
            label="Format"
            value={format.kind}
            onChange={(e) => {
              const k = e.target.value as SerialFormat['kind'];
              setFormat({ kind: k, json: JSON.stringify(FORMAT_TEMPLATES[k], null, 2) });
            }}
            options={[
              { value: 'csv', label: 'CSV lines' },
              { value: 'jsonl', label: 'JSON lines' },
              { value: 'scpi', label: 'SCPI polling' },
              { value: 'modbus', label: 'Modbus RTU registers' },
            ]}
          />
          <div className="flex flex-col gap-1 md:col-span-2">
            <label htmlFor="bench-format" className="text-sm font-medium text-ink-muted">
              Format details (JSON)
            </label>
            <textarea
              id="bench-format"
              value={format.json}
              onChange={(e) => setFormat({ ...format, json: e.target.value })}
              rows={8}
              spellCheck={false}
              className="num w-full rounded-lg border border-line bg-surface-sunken p-3 text-sm text-ink"
            />
          </div>
        </div>
      )}
      <TextField
        label="Load threshold (A)"
        inputMode="decimal"
        value={fields.loadOnAmps}
        onChange={set('loadOnAmps')}
        placeholder="0.2, or C/20 of a small pack's rating"
        hint="Discharge current at or above this counts as the load being on: the test starts, and means are taken under load. Set it below your smallest test current and above the meter's zero noise."
      />
      {kind !== 'none' && <FrameLimitsFields value={limits} onChange={setLimits} />}
      <MeterAccuracyFields value={accuracy} onChange={setAccuracy} />
      <TextField label="Notes" value={fields.notes} onChange={set('notes')} />
      <label className="flex min-h-11 items-center gap-3 text-ink">
        <input type="checkbox" checked={enabled} onChange={(e) => setEnabled(e.target.checked)} className="h-5 w-5" />
        Enabled (the server opens the source and watches it)
      </label>
      {(localError ?? serverError) && (
        <p role="alert" className="text-sm font-medium text-state-cutoff">
          {localError ?? serverError}
        </p>
      )}
      <div>
        <Button type="submit" disabled={save.isPending}>
          {bench ? 'Save bench' : 'Add bench'}
        </Button>
      </div>
    </form>
  );
}
