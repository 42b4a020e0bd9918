import { describe, expect, it } from 'vitest';
import type { RunEvent } from '../../../shared/schemas/run-event';
import { describeEvent } from './run-events-list';

// Demo figures of a fictional 12.8 V 100 Ah pack.
const cutoff: RunEvent = { elapsedSeconds: 7091, type: 'cutoff', cause: 'protection', volts: 10.646, amps: 46.9, dischargeWh: 1181.76, dischargeAh: 92.06 };
const milestone: RunEvent = { elapsedSeconds: 3840, type: 'milestone', milestone: 'half-rated-wh', volts: 12.93, dischargeWh: 640, dischargeAh: 49.09 };

describe('describeEvent', () => {
  it('writes energy in the lab unit: kWh when the lab chose it', () => {
    // 1,181.76 Wh = 1.182 kWh (SI prefix kilo = 1000).
    expect(describeEvent(cutoff, { energyUnit: 'kWh' })).toBe('Cutoff (pack protection opened) at 10.65 V after 1.182 kWh, 92.06 Ah');
    expect(describeEvent(milestone, { energyUnit: 'kWh' })).toBe('50 % of rated Wh: 12.93 V, 0.640 kWh, 49.09 Ah');
  });

  it('keeps Wh by default', () => {
    expect(describeEvent(cutoff)).toBe('Cutoff (pack protection opened) at 10.65 V after 1,181.8 Wh, 92.06 Ah');
  });
});
