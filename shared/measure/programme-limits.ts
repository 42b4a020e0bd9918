import type { Chemistry } from '../schemas/battery.js';
import type { ProgrammeStep, SimpleStep } from '../schemas/programme.js';

/**
 * The lowest end voltage per cell a programme may ask for, and the highest charge voltage per
 * cell, by chemistry. Sources (values from memory, no sheet at hand):
 * - lfp 2.5 V / 3.65 V: makers' data sheets of LiFePO4 cells typically state a 2.5 V discharge
 *   cut-off (some 2.0 V) and a 3.65 V charge voltage.
 * - nmc, nca 2.5 V / 4.2 V: makers' data sheets of 18650/21700 cells typically state a 2.5 V
 *   discharge cut-off and a 4.20 V charge voltage.
 * - lco 3.0 V / 4.2 V, lmo 2.5 V / 4.2 V: common practice for these cells.
 * - lto 1.5 V / 2.8 V: makers' data sheets typically state 1.5 V and 2.7 to 2.8 V.
 * - lead-acid 1.60 V / 2.50 V: makers' discharge tables go down to 1.60 V a cell at high rates
 *   (1.75 V at the 20 h rate); 2.4 to 2.5 V covers absorption and equalisation (common practice).
 * - nimh 0.9 V / 1.6 V: makers' data sheets typically end a discharge at 0.9 to 1.0 V a cell;
 *   NiMH is not CV-charged in practice, 1.6 V a cell is the top of a charge curve.
 */
export const CELL_VOLT_LIMITS: Readonly<Record<Chemistry, { floorVolts: number; ceilingVolts: number }>> = {
  lfp: { floorVolts: 2.5, ceilingVolts: 3.65 },
  nmc: { floorVolts: 2.5, ceilingVolts: 4.2 },
  nca: { floorVolts: 2.5, ceilingVolts: 4.2 },
  lco: { floorVolts: 3.0, ceilingVolts: 4.2 },
  lmo: { floorVolts: 2.5, ceilingVolts: 4.2 },
  lto: { floorVolts: 1.5, ceilingVolts: 2.8 },
  'lead-acid': { floorVolts: 1.6, ceilingVolts: 2.5 },
  nimh: { floorVolts: 0.9, ceilingVolts: 1.6 },
};

/**
 * How far above the pack protection's low-voltage cutoff the server stops a discharge, per
 * cell: the server, not the protection, should end the test, and 50 mV a cell is more than a
 * bench meter's error and the voltage jitter under load (our choice, common practice order).
 */
export const PROTECTION_MARGIN_VOLTS_PER_CELL = 0.05;

/** The pack a programme is checked against. */
export interface PackLimits {
  chemistry: Chemistry;
  cellsInSeries: number;
  /** The pack's protection (BMS) current rating, A. */
  maxCurrentAmps: number;
  /** The protection's low-voltage cutoff (pack volts), when the pack's record states one. */
  protectionCutoffVolts?: number | null;
}

/** One refused value: where it is (step path) and why. */
export interface ProgrammeProblem {
  path: string;
  message: string;
}

/** The lowest voltage the server lets a discharge reach on this pack (the safety net's floor), pack volts. */
export function safetyFloorVolts(pack: PackLimits): number {
  const chemistryFloor = CELL_VOLT_LIMITS[pack.chemistry].floorVolts * pack.cellsInSeries;
  const protectionFloor = pack.protectionCutoffVolts != null ? pack.protectionCutoffVolts + PROTECTION_MARGIN_VOLTS_PER_CELL * pack.cellsInSeries : -Infinity;
  return Math.max(chemistryFloor, protectionFloor);
}

/** The highest charge voltage allowed on this pack, pack volts. */
export function chargeCeilingVolts(pack: PackLimits): number {
  return CELL_VOLT_LIMITS[pack.chemistry].ceilingVolts * pack.cellsInSeries;
}

/** The largest current a discharge step can draw: CP at its end voltage, CR at the charge ceiling. */
export function peakDischargeAmps(step: Extract<SimpleStep, { kind: 'discharge' }>, pack: PackLimits): number {
  if (step.mode === 'cc') return step.value;
  if (step.mode === 'cp') return step.value / step.endVolts;
  return chargeCeilingVolts(pack) / step.value;
}

const fmt = (v: number) => `${Number(v.toFixed(3))}`;

function checkStep(step: SimpleStep, path: string, pack: PackLimits, out: ProgrammeProblem[]): void {
  const floor = safetyFloorVolts(pack);
  if (step.kind === 'charge') {
    const ceiling = chargeCeilingVolts(pack);
    if (step.volts > ceiling) out.push({ path: `${path}.volts`, message: `Charge voltage ${fmt(step.volts)} V is above the ${pack.chemistry} ceiling of ${fmt(ceiling)} V for ${pack.cellsInSeries} cells in series` });
    if (step.currentAmps > pack.maxCurrentAmps) out.push({ path: `${path}.currentAmps`, message: `Charge current ${fmt(step.currentAmps)} A is above the pack's protection rating of ${fmt(pack.maxCurrentAmps)} A` });
  }
  if (step.kind === 'discharge') {
    if (step.endVolts < floor) out.push({ path: `${path}.endVolts`, message: `End voltage ${fmt(step.endVolts)} V is below this pack's floor of ${fmt(floor)} V (the ${pack.chemistry} floor, or the protection's cutoff plus margin)` });
    const amps = peakDischargeAmps(step, pack);
    if (amps > pack.maxCurrentAmps) out.push({ path: `${path}.value`, message: `This discharge can draw ${fmt(amps)} A, above the pack's protection rating of ${fmt(pack.maxCurrentAmps)} A` });
  }
}

/** Every unsafe value in a programme for a pack (empty when it is safe to run). */
export function programmeProblems(steps: readonly ProgrammeStep[], pack: PackLimits): ProgrammeProblem[] {
  const out: ProgrammeProblem[] = [];
  steps.forEach((step, i) => {
    if (step.kind === 'repeat') step.steps.forEach((inner, j) => checkStep(inner, `steps.${i}.steps.${j}`, pack, out));
    else checkStep(step, `steps.${i}`, pack, out);
  });
  return out;
}
