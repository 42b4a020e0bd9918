import { describe, expect, it } from 'vitest';
import { tempProtectionsFrom } from './protection-presets';

describe('tempProtectionsFrom', () => {
  it('turns the ticked checks into protections on the channel, limits in °C', () => {
    const out = tempProtectionsFrom({ coldCharge: true, coldLimit: '0', hot: true, hotLimit: '60' }, 'C', 'cell');
    expect(out).toEqual([
      { kind: 'low-temp-charge', channel: 'cell', limitCelsius: 0, direction: 'below', current: 'charge' },
      { kind: 'high-temp', channel: 'cell', limitCelsius: 60, direction: 'above', current: 'any' },
    ]);
  });

  it('reads limits typed in °F in a °F lab', () => {
    // 32 °F = 0 °C and 140 °F = 60 °C (°C = (°F − 32) × 5/9, the Fahrenheit definition).
    const out = tempProtectionsFrom({ coldCharge: true, coldLimit: '32', hot: true, hotLimit: '140' }, 'F', 'cell');
    expect(out[0].limitCelsius).toBeCloseTo(0, 9);
    expect(out[1].limitCelsius).toBeCloseTo(60, 9);
  });

  it('gives none when nothing is ticked', () => {
    expect(tempProtectionsFrom({ coldCharge: false, coldLimit: '0', hot: false, hotLimit: '60' }, 'C', 'cell')).toEqual([]);
  });

  it('takes the common default for a limit left empty, whatever the lab unit', () => {
    const out = tempProtectionsFrom({ coldCharge: true, coldLimit: '', hot: true, hotLimit: ' ' }, 'F', 'cell');
    expect(out.map((p) => p.limitCelsius)).toEqual([0, 60]);
  });
});
