import { QueryTypes, type Sequelize } from 'sequelize';
import type { Run } from '../../shared/schemas/run.js';
import { EXPORT_DECIMALS } from '../../shared/units/export-number.js';
import { runColumnNames } from '../archive/archive-reader.js';
import type { BatteryFacts } from './measure-config.js';

/** Everything an export says about a run before its readings. */
export interface ExportMeta {
  run: Run;
  battery: BatteryFacts | null;
  bench: { id: number; name: string } | null;
  units: Record<string, string>;
  /** Stored column names (elapsedSeconds, t, volts, …, temp:cell, aux:heaterAmps), in export order. */
  columns: string[];
}

/**
 * Units of every exported column; positive amps = discharge. The run time column is
 * `elapsedSeconds` (files exported before the rename call it `elapsed`; both import back).
 */
export const EXPORT_UNITS: Record<string, string> = {
  elapsedSeconds: 's since run start',
  t: 's (source clock)',
  volts: 'V',
  amps: 'A (positive = discharge)',
  watts: 'W',
  dischargeWh: 'Wh',
  dischargeAh: 'Ah',
  chargeWh: 'Wh',
  chargeAh: 'Ah',
  'temp_*_c': '°C',
};

/**
 * The name a stored column carries in every export format (CSV header and JSON `columns`
 * alike): `temp:cell` becomes `temp_cell_c` (°C), `aux:heaterAmps` becomes `aux_heaterAmps`.
 */
export function exportColumnName(name: string): string {
  return name.startsWith('temp:') ? `temp_${name.slice(5)}_c` : name.startsWith('aux:') ? `aux_${name.slice(4)}` : name;
}

const DECIMALS_BY_COLUMN: Record<string, number> = {
  elapsedSeconds: EXPORT_DECIMALS.time,
  t: EXPORT_DECIMALS.time,
  volts: EXPORT_DECIMALS.volts,
  amps: EXPORT_DECIMALS.amps,
  watts: EXPORT_DECIMALS.watts,
  dischargeWh: EXPORT_DECIMALS.energy,
  chargeWh: EXPORT_DECIMALS.energy,
  dischargeAh: EXPORT_DECIMALS.charge,
  chargeAh: EXPORT_DECIMALS.charge,
};

/** Decimals an exported column keeps (see EXPORT_DECIMALS and docs/api.md). */
export function exportDecimals(name: string): number {
  return DECIMALS_BY_COLUMN[name] ?? (name.startsWith('temp:') ? EXPORT_DECIMALS.temperature : EXPORT_DECIMALS.other);
}

const FIXED = ['elapsedSeconds', 't', 'volts', 'amps', 'watts', 'dischargeWh', 'dischargeAh', 'chargeWh', 'chargeAh'];

/** Gathers the metadata block of an export, including every channel any chunk holds. */
export async function exportMeta(
  sequelize: Sequelize,
  run: Run,
  getBattery: (id: number) => Promise<BatteryFacts | null>,
): Promise<ExportMeta> {
  const extra = [...(await runColumnNames(sequelize, run.id))].filter((name) => !FIXED.includes(name));
  const battery = run.batteryId ? await getBattery(run.batteryId) : null;
  let bench: ExportMeta['bench'] = null;
  if (run.benchId) {
    // The benches table belongs to the ingest area; read only its name.
    const rows = await sequelize.query<{ id: number; name: string }>('SELECT id, name FROM benches WHERE id = ?', {
      replacements: [run.benchId],
      type: QueryTypes.SELECT,
    }).catch(() => []);
    bench = rows[0] ?? { id: run.benchId, name: `bench ${run.benchId}` };
  }
  return { run, battery, bench, units: EXPORT_UNITS, columns: [...FIXED, ...extra.sort()] };
}
