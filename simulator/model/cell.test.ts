import { describe, expect, it } from 'vitest';
import { createCell } from './cell.js';
import { CHEMISTRIES } from './chemistry.js';

const lfpCell = (initialSoc: number) =>
  createCell({ chemistry: 'lfp', ratedAh: 100, capacityAh: 100, ohmicOhms: 0.001, initialSoc });

describe('cell model', () => {
  it('resistance rises when cold and near empty', () => {
    const cell = lfpCell(0.5);
    // Li-ion resistance roughly doubles to triples from 25 °C to 0 °C (from memory, cell test literature).
    const ratio = cell.ohms(0) / cell.ohms(25);
    expect(ratio).toBeGreaterThan(1.8);
    expect(ratio).toBeLessThan(4);
    expect(cell.ohms(-20)).toBeGreaterThan(cell.ohms(0));
    const empty = lfpCell(0.02);
    expect(empty.ohms(25)).toBeGreaterThan(1.5 * cell.ohms(25));
  });

  it('counts charge: 20 A for one hour takes 20 % from a 100 Ah cell at its rated rate', () => {
    // At the rated rate (C/5 = 20 A for LFP here) Peukert's correction is 1, so coulombs are exact.
    const cell = lfpCell(1);
    for (let i = 0; i < 3600; i += 1) cell.step(20, 1, 25);
    expect(cell.soc).toBeCloseTo(0.8, 6);
  });

  it('relaxes: the voltage climbs back after the load stops, with the RC time constant', () => {
    const cell = lfpCell(0.5);
    for (let i = 0; i < 600; i += 1) cell.step(50, 1, 25);
    const tau = CHEMISTRIES.lfp.rcTauSeconds;
    const atStop = cell.ocv(25) - cell.rcVolts;
    expect(cell.rcVolts).toBeGreaterThan(0);
    const rested: number[] = [];
    for (let i = 0; i < 5 * tau; i += 1) {
      cell.step(0, 1, 25);
      rested.push(cell.ocv(25) - cell.rcVolts);
    }
    for (let i = 1; i < rested.length; i += 1) expect(rested[i]).toBeGreaterThanOrEqual(rested[i - 1]);
    expect(rested[rested.length - 1]).toBeGreaterThan(atStop);
    // After one time constant 1/e of the RC voltage is left (first-order RC response).
    const afterTau = rested[tau - 1] - atStop;
    const total = cell.ocv(25) - atStop;
    expect(afterTau / total).toBeCloseTo(1 - Math.exp(-1), 2);
  });
});
