import { describe, expect, it } from 'vitest';
import { CHEMISTRIES } from './chemistry.js';
import { createCell } from './cell.js';
import { meanOcvCellVolts, ocvAt } from './ocv.js';

const ROOM_C = 25;
const STEP_S = 1;

/** Charges a fresh cell CC-CV at cvVolts with C/2, to a C/20 taper (the usual CC-CV recipe, common practice). */
function chargeToTaper(chemistry: keyof typeof CHEMISTRIES, cvVolts: number): { soc: number; maxVolts: number } {
  const ratedAh = 100;
  const cell = createCell({ chemistry, ratedAh, capacityAh: ratedAh, ohmicOhms: CHEMISTRIES[chemistry].ohmAhProduct / ratedAh, initialSoc: 0.2 });
  let maxVolts = 0;
  for (let t = 0; t < 10 * 3600; t += STEP_S) {
    const ohms = cell.ohms(ROOM_C);
    const source = cell.ocv(ROOM_C) - cell.rcVolts;
    const amps = -Math.min(ratedAh / 2, Math.max(0, (cvVolts - source) / ohms));
    maxVolts = Math.max(maxVolts, source - amps * ohms);
    if (-amps < ratedAh / 20) break;
    cell.step(amps, STEP_S, ROOM_C);
  }
  return { soc: cell.soc, maxVolts };
}

/** Discharges a full cell at 0.2 C to an end voltage; returns Ah delivered over rated Ah. */
function capacityToEnd(chemistry: keyof typeof CHEMISTRIES, endVolts: number): number {
  const ratedAh = 100;
  const amps = ratedAh / 5;
  const cell = createCell({ chemistry, ratedAh, capacityAh: ratedAh, ohmicOhms: CHEMISTRIES[chemistry].ohmAhProduct / ratedAh, initialSoc: 1 });
  let ah = 0;
  while (cell.ocv(ROOM_C) - cell.rcVolts - amps * cell.ohms(ROOM_C) > endVolts) {
    cell.step(amps, STEP_S, ROOM_C);
    ah += (amps * STEP_S) / 3600;
  }
  return ah / ratedAh;
}

describe('open-circuit voltage curves against published cell values', () => {
  it('LFP: nominal 3.2-3.3 V a cell, 3.65 V charge limit fills the cell without exceeding it', () => {
    // LFP cell datasheets: nominal 3.2 V (energy-weighted mean ~3.2-3.3 V), charge 3.65 V,
    // discharge cutoff 2.5 V (typical datasheet class values, from memory).
    const nominal = meanOcvCellVolts('lfp');
    expect(nominal).toBeGreaterThanOrEqual(3.2);
    expect(nominal).toBeLessThanOrEqual(3.3);
    expect(ocvAt('lfp', 1)).toBeLessThanOrEqual(3.65);
    const charged = chargeToTaper('lfp', 3.65);
    expect(charged.soc).toBeGreaterThan(0.97);
    expect(charged.maxVolts).toBeLessThanOrEqual(3.65 + 1e-9);
    // A 0.2 C discharge from full to 2.5 V gives about the rated capacity (datasheet practice: rated at 0.2 C).
    expect(capacityToEnd('lfp', 2.5)).toBeGreaterThan(0.95);
    expect(capacityToEnd('lfp', 2.5)).toBeLessThan(1.03);
  });

  it('LFP: a full cell rests at about 3.35-3.45 V, so a full 4-cell pack starts a 0.4 C discharge well below 14 V', () => {
    // Rested LFP after charge: about 3.35-3.45 V a cell (from memory); 3.6 V is a charging voltage.
    expect(ocvAt('lfp', 1)).toBeGreaterThanOrEqual(3.35);
    expect(ocvAt('lfp', 1)).toBeLessThanOrEqual(3.45);
    const ratedAh = 100;
    const cell = createCell({ chemistry: 'lfp', ratedAh, capacityAh: ratedAh, ohmicOhms: CHEMISTRIES.lfp.ohmAhProduct / ratedAh, initialSoc: 1 });
    const startPackVolts = 4 * (cell.ocv(ROOM_C) - 0.4 * ratedAh * cell.ohms(ROOM_C));
    expect(startPackVolts).toBeLessThan(13.8);
    expect(startPackVolts).toBeGreaterThan(13.2);
  });

  it('NMC: nominal 3.6-3.7 V, 4.2 V charge limit, about rated capacity to 3.0 V', () => {
    // NMC cell datasheets: nominal 3.6-3.7 V, charge 4.2 V, cutoff 2.5-3.0 V (from memory).
    const nominal = meanOcvCellVolts('nmc');
    expect(nominal).toBeGreaterThanOrEqual(3.6);
    expect(nominal).toBeLessThanOrEqual(3.75);
    const charged = chargeToTaper('nmc', 4.2);
    expect(charged.soc).toBeGreaterThan(0.97);
    expect(charged.maxVolts).toBeLessThanOrEqual(4.2 + 1e-9);
    expect(capacityToEnd('nmc', 3.0)).toBeGreaterThan(0.93);
  });

  it('lead-acid: 12.6-12.8 V rested when full and about 12 V nominal for six cells', () => {
    // The widely published state-of-charge table for 12 V lead-acid at rest: 12.6-12.7 V
    // full, about 12.0-12.2 V at half (from memory); nominal 2.0 V a cell (common practice).
    const cells = 6;
    expect(ocvAt('lead-acid', 1) * cells).toBeGreaterThanOrEqual(12.6);
    expect(ocvAt('lead-acid', 1) * cells).toBeLessThanOrEqual(12.8);
    expect(ocvAt('lead-acid', 0.5) * cells).toBeGreaterThanOrEqual(12.0);
    expect(ocvAt('lead-acid', 0.5) * cells).toBeLessThanOrEqual(12.2);
    expect(meanOcvCellVolts('lead-acid')).toBeCloseTo(2.0, 1);
  });

  it('every curve rises with state of charge (a cell never reads lower when fuller)', () => {
    for (const chemistry of Object.keys(CHEMISTRIES) as (keyof typeof CHEMISTRIES)[]) {
      for (let soc = 0; soc < 1; soc += 0.01) expect(ocvAt(chemistry, soc + 0.01)).toBeGreaterThan(ocvAt(chemistry, soc));
    }
  });
});
