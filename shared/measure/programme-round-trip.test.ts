import { describe, expect, it } from 'vitest';
import type { StepResult } from '../schemas/programme-run.js';
import { programmeRoundTrips } from './programme-round-trip.js';

// Figures of a made-up capacity programme (demo values); the efficiencies are their ratios by definition.
const step = (index: number, over: Partial<StepResult>): StepResult => ({
  index, label: `${index + 1}`, kind: 'rest', outcome: 'done', cause: 'time', reason: '', startElapsedSeconds: 0, endElapsedSeconds: 0,
  chargeAh: 0, chargeWh: 0, dischargeAh: 0, dischargeWh: 0, endVolts: 13, ...over,
});
const fullCharge = (i: number, ah: number, wh: number) => step(i, { kind: 'charge', cause: 'taper', chargeAh: ah, chargeWh: wh });
const discharge = (i: number, ah: number, wh: number) => step(i, { kind: 'discharge', cause: 'end-voltage', dischargeAh: ah, dischargeWh: wh });

describe('programme round trips', () => {
  it('full, rest, empty, rest, full: Wh out ÷ Wh in of the recharge', () => {
    const pairs = programmeRoundTrips([fullCharge(0, 12, 160), step(1, {}), discharge(2, 20, 256), step(3, {}), fullCharge(4, 20.4, 272)]);
    expect(pairs).toEqual([{ dischargeIndex: 2, chargeIndex: 4, energyEfficiency: 256 / 272, coulombicEfficiency: 20 / 20.4 }]);
  });

  it('no pair for a discharge that did not start full, or a recharge ended by its time limit', () => {
    expect(programmeRoundTrips([discharge(0, 5, 64), fullCharge(1, 20.4, 272)])).toEqual([]);
    expect(programmeRoundTrips([fullCharge(0, 1, 14), discharge(1, 20, 256), step(2, { kind: 'charge', cause: 'time', chargeAh: 10, chargeWh: 136 })])).toEqual([]);
  });

  it('a skipped discharge makes no pair; a repeat block gives one pair a pass', () => {
    expect(programmeRoundTrips([fullCharge(0, 1, 14), step(1, { kind: 'discharge', outcome: 'skipped', cause: 'skipped', dischargeWh: 10, dischargeAh: 1 }), fullCharge(2, 1, 14)])).toEqual([]);
    const pairs = programmeRoundTrips([fullCharge(0, 1, 14), discharge(1, 20, 256), fullCharge(2, 20.4, 272), discharge(3, 19, 243), fullCharge(4, 19.5, 262)]);
    expect(pairs.map((p) => [p.dischargeIndex, p.chargeIndex])).toEqual([[1, 2], [3, 4]]);
  });
});
