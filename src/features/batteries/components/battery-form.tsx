import { useForm } from 'react-hook-form';
import { CHEMISTRIES, type Battery, type BatteryInput, type Chemistry } from '../../../../shared/schemas/battery';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useCreateBattery, useUpdateBattery } from '../api/batteries';
import { CHEMISTRY_LABEL } from '../../../lib/chemistry-label';
import { useState } from 'react';
import { PROTECTIONS, PROTECTION_TRAITS, type Protection } from '../../../../shared/schemas/protection-check';
import { useLabSettings } from '../../../lib/lab-settings';
import { rowsFromSpecs, specsFromRows, type SpecRows } from './protection-spec-rows';

interface Values {
  label: string;
  brand: string;
  model: string;
  chemistry: Chemistry;
  cellsInSeries: string;
  cellsInParallel: string;
  ratedAh: string;
  ratedWh: string;
  bmsRatedAmps: string;
  massKg: string;
  serialNumber: string;
  sender: string;
  owner: string;
  receivedOn: string;
  lengthMm: string;
  widthMm: string;
  heightMm: string;
  terminalType: string;
  statedCycleLife: string;
  warrantyMonths: string;
  price: string;
  priceCurrency: string;
  notes: string;
  specs: SpecRows;
}

const optionalNumber = (v: string) => (v.trim() === '' ? null : Number(v));
const positive = (v: string) => v.trim() === '' || Number(v) > 0 || 'A number above 0.';
const wholeOrEmpty = (v: string) => v.trim() === '' || (Number.isInteger(Number(v)) && Number(v) >= 0) || 'A whole number.';
const nonNegative = (v: string) => v.trim() === '' || Number(v) >= 0 || 'A number, 0 or more.';
const orNull = (v: string) => v.trim() || null;

const text = (v: string | number | null | undefined) => (v === null || v === undefined ? '' : String(v));

function initialValues(unit: 'C' | 'F', b?: Battery): Values {
  return {
    label: text(b?.label), brand: text(b?.brand), model: text(b?.model), chemistry: b?.chemistry ?? 'lfp',
    cellsInSeries: text(b?.cellsInSeries), cellsInParallel: text(b?.cellsInParallel ?? 1), ratedAh: text(b?.ratedAh),
    ratedWh: text(b?.ratedWh), bmsRatedAmps: text(b?.bmsRatedAmps), massKg: text(b?.massKg),
    serialNumber: text(b?.serialNumber), sender: text(b?.sender), owner: text(b?.owner), receivedOn: text(b?.receivedOn),
    lengthMm: text(b?.lengthMm), widthMm: text(b?.widthMm), heightMm: text(b?.heightMm), terminalType: text(b?.terminalType),
    statedCycleLife: text(b?.statedCycleLife), warrantyMonths: text(b?.warrantyMonths), price: text(b?.price),
    priceCurrency: text(b?.priceCurrency), notes: text(b?.notes),
    specs: rowsFromSpecs(b?.protectionSpecs ?? [], unit),
  };
}

/** Registers a pack as it arrives at the lab, or corrects one (technicians and lab managers). */
export function BatteryForm({ battery, onDone }: { battery?: Battery; onDone: () => void }) {
  const createMutation = useCreateBattery();
  const updateMutation = useUpdateBattery();
  const create = battery ? updateMutation : createMutation;
  const { temperatureUnit: unit } = useLabSettings();
  const { register, handleSubmit, formState: { errors } } = useForm<Values>({ defaultValues: initialValues(unit, battery) });
  const [specErrors, setSpecErrors] = useState<Partial<Record<Protection, string>>>({});
  const server = create.error instanceof ApiError ? create.error.fields : {};

  const onSubmit = handleSubmit((v) => {
    const stated = specsFromRows(v.specs, unit, battery?.protectionSpecs ?? []);
    setSpecErrors(stated.errors);
    if (Object.keys(stated.errors).length > 0) return;
    const body: BatteryInput = {
      label: v.label.trim(),
      brand: v.brand.trim(),
      model: v.model.trim() || null,
      chemistry: v.chemistry,
      cellsInSeries: Number(v.cellsInSeries),
      cellsInParallel: Number(v.cellsInParallel || 1),
      ratedAh: Number(v.ratedAh),
      ratedWh: optionalNumber(v.ratedWh),
      bmsRatedAmps: optionalNumber(v.bmsRatedAmps),
      massKg: optionalNumber(v.massKg),
      serialNumber: v.serialNumber.trim() || null,
      sender: orNull(v.sender),
      owner: orNull(v.owner),
      receivedOn: orNull(v.receivedOn),
      lengthMm: optionalNumber(v.lengthMm),
      widthMm: optionalNumber(v.widthMm),
      heightMm: optionalNumber(v.heightMm),
      terminalType: orNull(v.terminalType),
      statedCycleLife: optionalNumber(v.statedCycleLife),
      warrantyMonths: optionalNumber(v.warrantyMonths),
      price: optionalNumber(v.price),
      priceCurrency: orNull(v.priceCurrency.toUpperCase()),
      notes: orNull(v.notes),
      protectionSpecs: stated.specs,
    };
    if (battery) updateMutation.mutate({ id: battery.id, patch: body }, { onSuccess: onDone });
    else createMutation.mutate(body, { onSuccess: onDone });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label={battery ? `Edit ${battery.label}` : 'Register a pack'} className="grid gap-4 md:grid-cols-3">
      <TextField label="Label" placeholder="NG-0142" error={errors.label?.message ?? server.label} {...register('label', { required: 'Give the pack a label.' })} />
      <TextField label="Brand" placeholder="Voltara" error={errors.brand?.message ?? server.brand} {...register('brand', { required: 'Enter the brand.' })} />
      <TextField label="Model" {...register('model')} />
      <SelectField label="Chemistry" options={CHEMISTRIES.map((c) => ({ value: c, label: CHEMISTRY_LABEL[c] }))} {...register('chemistry')} />
      <TextField label="Cells in series" inputMode="numeric" error={errors.cellsInSeries?.message ?? server.cellsInSeries} {...register('cellsInSeries', { validate: (v) => (Number.isInteger(Number(v)) && Number(v) >= 1) || 'A whole number, 1 or more.' })} />
      <TextField label="Cells in parallel" inputMode="numeric" {...register('cellsInParallel')} />
      <TextField label="Rated capacity (Ah)" inputMode="decimal" error={errors.ratedAh?.message ?? server.ratedAh} {...register('ratedAh', { required: 'Enter the rated Ah.', validate: positive })} />
      <TextField label="Rated energy (Wh)" inputMode="decimal" error={errors.ratedWh?.message} {...register('ratedWh', { validate: positive })} />
      <TextField label="Protection current (A)" inputMode="decimal" error={errors.bmsRatedAmps?.message} {...register('bmsRatedAmps', { validate: positive })} />
      <TextField label="Mass (kg)" inputMode="decimal" error={errors.massKg?.message} {...register('massKg', { validate: positive })} />
      <TextField label="Serial number" {...register('serialNumber')} />
      <TextField label="Sent by" placeholder="Kestrel Energy" {...register('sender')} />
      <TextField label="Owner or client" error={server.owner} {...register('owner')} />
      <TextField label="Received on" type="date" error={server.receivedOn} {...register('receivedOn')} />
      <TextField label="Length (mm)" inputMode="decimal" error={errors.lengthMm?.message ?? server.lengthMm} {...register('lengthMm', { validate: positive })} />
      <TextField label="Width (mm)" inputMode="decimal" error={errors.widthMm?.message ?? server.widthMm} {...register('widthMm', { validate: positive })} />
      <TextField label="Height (mm)" inputMode="decimal" error={errors.heightMm?.message ?? server.heightMm} {...register('heightMm', { validate: positive })} />
      <TextField label="Terminal type" placeholder="M8 studs" {...register('terminalType')} />
      <TextField label="Stated cycle life (cycles)" inputMode="numeric" error={errors.statedCycleLife?.message ?? server.statedCycleLife} {...register('statedCycleLife', { validate: wholeOrEmpty })} />
      <TextField label="Warranty (months)" inputMode="numeric" error={errors.warrantyMonths?.message ?? server.warrantyMonths} {...register('warrantyMonths', { validate: wholeOrEmpty })} />
      <TextField label="Price" inputMode="decimal" error={errors.price?.message ?? server.price} {...register('price', { validate: nonNegative })} />
      <TextField label="Currency" placeholder="EUR" maxLength={3} error={server.priceCurrency} {...register('priceCurrency')} />
      <div className="flex flex-col gap-1 md:col-span-3">
        <label htmlFor="battery-notes" className="text-sm font-medium text-ink-muted">
          Notes
        </label>
        <textarea id="battery-notes" rows={3} className="w-full rounded-lg border border-line bg-surface-sunken px-3 py-2 text-base text-ink focus:border-accent focus:outline-none" {...register('notes')} />
        {server.notes && <p role="alert" className="text-sm font-medium text-state-cutoff">{server.notes}</p>}
      </div>
      <details className="rounded-lg border border-line p-4 md:col-span-3" open={Object.keys(specErrors).length > 0 || undefined}>
        <summary className="cursor-pointer text-sm font-semibold">Stated protections (from the maker; protection checks are judged against them)</summary>
        <div className="mt-3 flex flex-col gap-3">
          {PROTECTIONS.map((p) => {
            const t = PROTECTION_TRAITS[p];
            const u = t.unit === '°C' ? `°${unit}` : t.unit === 'V' ? 'V, whole pack' : t.unit;
            return (
              <div key={p} className="grid gap-3 md:grid-cols-3">
                <TextField label={`${t.label}: threshold (${u})`} inputMode="decimal" error={specErrors[p]} {...register(`specs.${p}.threshold`)} />
                <TextField label={`${t.label}: delay (s)`} inputMode="decimal" {...register(`specs.${p}.delay`)} />
                <TextField label={`${t.label}: release (${u})`} inputMode="decimal" {...register(`specs.${p}.release`)} />
              </div>
            );
          })}
          {server.protectionSpecs && (
            <p role="alert" className="text-sm font-medium text-state-cutoff">
              {server.protectionSpecs}
            </p>
          )}
        </div>
      </details>
      {create.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff md:col-span-3">
          {create.error instanceof Error ? create.error.message : 'The pack was not saved.'}
        </p>
      )}
      <div className="flex gap-2 md:col-span-3">
        <Button type="submit" disabled={create.isPending}>
          {battery ? 'Save changes' : 'Register pack'}
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
