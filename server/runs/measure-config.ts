import type { MeasureConfigInput } from '../../shared/schemas/measure-config.js';
import { ChemistrySchema } from '../../shared/schemas/chemistry.js';
import type { RunConfig } from './runs-repo.js';
import type { ProtectionSpec } from '../../shared/schemas/protection-check.js';

/** What the recorder and importer need to know of a battery. */
export interface BatteryFacts {
  id: number;
  label: string;
  brand: string;
  chemistry: string;
  cellsInSeries: number;
  ratedAh: number;
  ratedWh: number | null;
  price: number | null;
  massKg: number | null;
  /** What the pack's maker states for its protections (empty when nothing is stated). */
  protectionSpecs: ProtectionSpec[];
}

/** Builds the measurement core's config from a run's settings and its battery. */
export function measureConfigFor(config: RunConfig, battery: BatteryFacts | null): MeasureConfigInput {
  // The core knows fewer chemistries than the battery form offers; the rest count as "other".
  const chemistry = battery ? (ChemistrySchema.safeParse(battery.chemistry).data ?? 'other') : undefined;
  const out: MeasureConfigInput = {
    chemistry,
    cellsInSeries: battery?.cellsInSeries,
    ratedAh: battery?.ratedAh,
    ratedWh: battery?.ratedWh ?? undefined,
  };
  const ev = config.endVolts;
  if (ev?.mode === 'absolute') out.endVolts = ev.volts;
  if (ev?.mode === 'per-cell') {
    out.endVoltsPerCell = ev.voltsPerCell;
    if (ev.cellsInSeries) out.cellsInSeries = ev.cellsInSeries;
  }
  if (config.alarms.nearEndMarginVolts !== undefined) out.warnMarginVolts = config.alarms.nearEndMarginVolts;
  if (config.tempProtections?.length) out.tempProtections = config.tempProtections;
  if (config.protectionChecks?.length) out.protectionChecks = config.protectionChecks;
  return out;
}
