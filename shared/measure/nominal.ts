import type { Chemistry } from '../schemas/chemistry.js';

/**
 * Nominal volts per cell by chemistry (common practice): lithium iron phosphate 3.2 V,
 * NMC/NCA 3.6 V (some makers state 3.7 V: pass it explicitly), LTO 2.4 V, lead-acid 2.0 V,
 * NiMH 1.2 V. `other` has no nominal voltage.
 */
export const NOMINAL_VOLTS_PER_CELL: Readonly<Record<Chemistry, number | null>> = {
  lfp: 3.2,
  nmc: 3.6,
  nca: 3.6,
  lto: 2.4,
  'lead-acid': 2.0,
  nimh: 1.2,
  other: null,
};

/** Nominal pack voltage: volts per cell × cells in series (null when unknown). */
export function nominalVolts(chemistry: Chemistry | null | undefined, cellsInSeries: number | null | undefined, voltsPerCell?: number): number | null {
  const perCell = voltsPerCell ?? (chemistry ? NOMINAL_VOLTS_PER_CELL[chemistry] : null);
  if (perCell == null || cellsInSeries == null) return null;
  return perCell * cellsInSeries;
}

/** Nominal energy: nominal volts × rated Ah (null when either is unknown). */
export function nominalWh(chemistry: Chemistry | null | undefined, cellsInSeries: number | null | undefined, ratedAh: number | null | undefined, voltsPerCell?: number): number | null {
  const v = nominalVolts(chemistry, cellsInSeries, voltsPerCell);
  return v === null || ratedAh == null ? null : v * ratedAh;
}

/** Pack voltage for a per-cell voltage (e.g. a charge voltage of 3.6 V a cell × 8 = 28.8 V). */
export function packVolts(voltsPerCell: number, cellsInSeries: number): number {
  return voltsPerCell * cellsInSeries;
}
