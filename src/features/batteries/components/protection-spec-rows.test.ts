import { describe, expect, it } from 'vitest';
import { rowsFromSpecs, specsFromRows } from './protection-spec-rows';

describe('a pack\'s stated protections on its form', () => {
  it('round-trips a record through the form in a °F lab', () => {
    // 0 °C = 32 °F and 3 °C = 37.4 °F (°F = °C × 9/5 + 32, the Fahrenheit definition).
    const specs = [
      { protection: 'cold-charge' as const, thresholdValue: 0, delaySeconds: 5, releaseValue: 3, thresholdTolerance: 1, delayToleranceSeconds: null },
      { protection: 'low-voltage' as const, thresholdValue: 40, delaySeconds: 2, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null },
    ];
    const rows = rowsFromSpecs(specs, 'F');
    expect(rows['cold-charge']).toEqual({ threshold: '32', delay: '5', release: '37.4' });
    expect(rows['low-voltage']).toEqual({ threshold: '40', delay: '2', release: '' });
    const back = specsFromRows(rows, 'F', specs);
    expect(back.errors).toEqual({});
    expect(back.specs[0]!.releaseValue).toBeCloseTo(3, 9);
    expect(back.specs[0]!.thresholdTolerance).toBe(1);
    expect(back.specs[1]).toEqual(specs[1]);
  });

  it('refuses a delay typed without a threshold', () => {
    const rows = rowsFromSpecs([], 'C');
    rows['over-current'] = { threshold: '', delay: '1', release: '' };
    expect(specsFromRows(rows, 'C', []).errors['over-current']).toMatch(/threshold/);
  });
});
