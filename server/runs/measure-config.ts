import type { MeasureConfigInput } from '../../shared/schemas/measure-config.js';
import { ChemistrySchema } from '../../shared/schemas/chemistry.js';
import type { MeterAccuracy } from '../../shared/schemas/meter-accuracy.js';
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

/** What a run needs to know of where its readings come from (a bench's source, or an imported file). */
export interface SourceFacts {
  /** The source's own interval between readings, s (a poll period or a log's median interval); null = unknown. */
  cadenceSeconds: number | null;
  /** The bench's load threshold, A; null = the core's default. */
  loadOnAmps?: number | null;
  /** The bench meter's stated accuracy; null or absent = not stated. */
  meterAccuracy?: MeterAccuracy | null;
}

/** Builds the measurement core's config from a run's settings, its battery and its source. */
export function measureConfigFor(config: RunConfig, battery: BatteryFacts | null, source: SourceFacts | null = null): MeasureConfigInput {
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
  // A limit typed on the run wins; otherwise the core derives it from the source's cadence.
  if (config.maxGapSeconds != null) out.maxGapSeconds = config.maxGapSeconds;
  if (source?.cadenceSeconds != null) out.cadenceSeconds = source.cadenceSeconds;
  if (source?.loadOnAmps != null) out.loadOnAmps = source.loadOnAmps;
  if (config.protectionChecks?.length) out.protectionChecks = config.protectionChecks;
  return out;
}
