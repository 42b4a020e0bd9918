import { describe, expect, it } from 'vitest';
import { chargeAmps, dischargeAmps } from './load.js';

const SOURCE_V = 13.2;
const OHMS = 0.01;
const terminal = (amps: number) => SOURCE_V - amps * OHMS;

describe('loads and charger', () => {
  it('constant power: the terminal volts times the current equal the set power', () => {
    const amps = dischargeAmps({ mode: 'cp', watts: 600 }, SOURCE_V, OHMS);
    expect(terminal(amps) * amps).toBeCloseTo(600, 9);
    // The low-current root: the load runs above half the source voltage (stable operating point).
    expect(terminal(amps)).toBeGreaterThan(SOURCE_V / 2);
  });

  it('constant power beyond what the pack can give sits at the maximum-power point V/2', () => {
    const amps = dischargeAmps({ mode: 'cp', watts: 10_000 }, SOURCE_V, OHMS);
    expect(terminal(amps)).toBeCloseTo(SOURCE_V / 2, 9);
  });

  it('constant resistance follows Ohm\'s law and constant current is the set current', () => {
    const amps = dischargeAmps({ mode: 'cr', ohms: 0.5 }, SOURCE_V, OHMS);
    expect(terminal(amps) / amps).toBeCloseTo(0.5, 9);
    expect(dischargeAmps({ mode: 'cc', amps: 25 }, SOURCE_V, OHMS)).toBe(25);
  });

  it('charger: current limit in CC, voltage limit in CV, heater current taken from the limit', () => {
    const charger = { cvVolts: 14.4, ccAmps: 20 };
    expect(chargeAmps(charger, 13.0, OHMS, 0)).toBe(-20);
    const cv = chargeAmps(charger, 14.3, OHMS, 0);
    // In CV the terminal sits at the set voltage: source − I·R = 14.4 V.
    expect(14.3 - cv * OHMS).toBeCloseTo(14.4, 9);
    expect(chargeAmps(charger, 13.0, OHMS, 2.5)).toBe(-17.5);
    expect(Math.abs(chargeAmps(charger, 14.5, OHMS, 0))).toBe(0);
  });
});
