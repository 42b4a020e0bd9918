import { SelectField, TextField } from '../../../components/ui/field';
import type { ImportRunInput } from '../api/import-run';

const SIGN_OPTIONS = [
  { value: 'auto', label: 'Work it out (lower mean voltage is discharge; asks when the file cannot tell)' },
  { value: 'discharge-positive', label: 'Positive amps = discharge' },
  { value: 'discharge-negative', label: 'Negative amps = discharge' },
] as const;

const TIME_FORMAT_OPTIONS = [
  { value: '', label: 'From the header or the values (asks when unsure)' },
  { value: 's', label: 'Seconds (elapsed or since 1970)' },
  { value: 'ms', label: 'Milliseconds (elapsed or since 1970)' },
  { value: 'min', label: 'Minutes' },
  { value: 'h', label: 'Hours' },
  { value: 'hms', label: 'h:mm:ss' },
  { value: 'iso', label: 'ISO 8601 date-time (2026-07-15 12:00:00)' },
  { value: 'dmy', label: 'Day first: dd.mm.yyyy hh:mm:ss' },
  { value: 'mdy', label: 'Month first: mm/dd/yyyy hh:mm:ss' },
  { value: 'serial-days', label: 'Spreadsheet serial days (46218.5)' },
] as const;

/** The choices of an import beyond file, name and pack, as the form holds them (text while typed). */
export interface ImportOptions {
  currentSign: ImportRunInput['currentSign'];
  timeFormat: '' | NonNullable<ImportRunInput['timeFormat']>;
  tempUnit: '' | NonNullable<ImportRunInput['tempUnit']>;
  acceptancePercent: string;
  electrolyteTempCelsius: string;
  maxGapSeconds: string;
}

/** Checks the typed numbers; a message for the first wrong one, else null. */
export function importOptionsError(o: ImportOptions): string | null {
  const acceptance = Number(o.acceptancePercent);
  if (o.acceptancePercent.trim() === '' || !(acceptance >= 1 && acceptance <= 100)) return 'The acceptance must be a share of rated capacity from 1 to 100 %.';
  if (o.electrolyteTempCelsius.trim() !== '' && !Number.isFinite(Number(o.electrolyteTempCelsius))) return 'The electrolyte temperature must be a number in °C.';
  if (o.maxGapSeconds.trim() !== '' && !(Number(o.maxGapSeconds) > 0)) return 'The gap limit must be a number of seconds above 0, or blank.';
  return null;
}

/** The typed options as the API call takes them (blank fields left out). */
export function importOptionsInput(o: ImportOptions): Pick<ImportRunInput, 'currentSign' | 'timeFormat' | 'tempUnit' | 'acceptancePercent' | 'electrolyteTempCelsius' | 'maxGapSeconds'> {
  const num = (text: string) => (text.trim() === '' ? undefined : Number(text));
  return {
    currentSign: o.currentSign,
    timeFormat: o.timeFormat || undefined,
    tempUnit: o.tempUnit || undefined,
    acceptancePercent: num(o.acceptancePercent),
    electrolyteTempCelsius: num(o.electrolyteTempCelsius),
    maxGapSeconds: num(o.maxGapSeconds),
  };
}

interface Props {
  value: ImportOptions;
  onChange: (next: ImportOptions) => void;
  /** The lab's temperature unit, named in the default choice. */
  labTempUnit: 'C' | 'F';
  /** Show the electrolyte temperature (a lead-acid pack is chosen). */
  leadAcid: boolean;
  /** Per-field messages from the server (timeFormat, currentSign, tempUnit, ...). */
  errors: Record<string, string>;
}

/** How to read the file (time, sign, temperature unit, gaps) and what to judge it by (acceptance, electrolyte temperature). */
export function ImportOptionsFields({ value, onChange, labTempUnit, leadAcid, errors }: Props) {
  const set = <K extends keyof ImportOptions>(key: K, v: ImportOptions[K]) => onChange({ ...value, [key]: v });
  return (
    <>
      <SelectField label="Time column format" value={value.timeFormat} error={errors.timeFormat} onChange={(e) => set('timeFormat', e.target.value as ImportOptions['timeFormat'])} options={TIME_FORMAT_OPTIONS} />
      <SelectField label="Current sign in the file" value={value.currentSign} error={errors.currentSign} onChange={(e) => set('currentSign', e.target.value as ImportOptions['currentSign'])} options={SIGN_OPTIONS} />
      <SelectField
        label="Temperature unit (when the header names none)"
        value={value.tempUnit}
        error={errors.tempUnit}
        onChange={(e) => set('tempUnit', e.target.value as ImportOptions['tempUnit'])}
        options={[
          { value: '', label: `The lab's unit (°${labTempUnit})` },
          { value: 'C', label: '°C' },
          { value: 'F', label: '°F' },
          { value: 'K', label: 'K' },
        ]}
      />
      <TextField label="Acceptance (% of rated capacity to pass)" inputMode="decimal" value={value.acceptancePercent} error={errors.acceptancePercent} onChange={(e) => set('acceptancePercent', e.target.value)} />
      <TextField
        label="Gap limit (s, optional)"
        inputMode="decimal"
        value={value.maxGapSeconds}
        error={errors.maxGapSeconds}
        hint="Blank: 3 × the file's median interval. A longer step is a gap, not integrated across."
        onChange={(e) => set('maxGapSeconds', e.target.value)}
      />
      {leadAcid && (
        <TextField
          label="Electrolyte temperature at the start (°C)"
          inputMode="decimal"
          value={value.electrolyteTempCelsius}
          error={errors.electrolyteTempCelsius}
          hint="Corrects the capacity to 25 °C (IEEE 450): a cold battery is credited. Ventilate: charging lead-acid gives off hydrogen."
          onChange={(e) => set('electrolyteTempCelsius', e.target.value)}
        />
      )}
    </>
  );
}
