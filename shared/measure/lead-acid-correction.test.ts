import { describe, expect, it } from 'vitest';
import { CAPACITY_FACTOR_FROM_MEMORY, capacityFactorTo25C, correctedAhAt25C, ieee450PercentCapacity, inCapacityFactorRange } from './lead-acid-correction.js';

describe('lead-acid capacity corrected to 25 °C (IEEE 450; factor table from memory)', () => {
  it('leaves a test at 25 °C (77 °F), the reference temperature, as measured', () => {
    expect(capacityFactorTo25C(25)).toBeCloseTo(1, 12);
    expect(correctedAhAt25C(100, 25)).toBeCloseTo(100, 12);
  });

  it('credits a cold battery: 90 Ah at 10 °C corrects UP, never down to 75.63 Ah', () => {
    // Direction: capacity falls with temperature, so a cold result corrected to 25 °C is higher (IEEE 450).
    const corrected = correctedAhAt25C(90, 10);
    expect(corrected).toBeGreaterThan(90);
    expect(corrected).not.toBeCloseTo(75.63, 1); // 90 ÷ 1.19, the wrong way round
    expect(corrected).toBeCloseTo(90 * 1.19, 9); // 50 °F: factor 1.19 (table value, from memory)
  });

  it('debits a warm battery: 90 Ah at 40 °C corrects DOWN, not up to 100.67 Ah', () => {
    const corrected = correctedAhAt25C(90, 40);
    expect(corrected).toBeLessThan(90);
    expect(corrected).not.toBeCloseTo(100.67, 1);
  });

  it('time-adjusted %: an 8 h rated test at 50 °F that ran 7 h is 7 × 1.19 ÷ 8 = 104.1 % (formula of the method)', () => {
    expect(ieee450PercentCapacity(7 * 3600, 8 * 3600, 10)).toBeCloseTo((7 * 1.19 * 100) / 8, 9);
    expect(ieee450PercentCapacity(7 * 3600, 8 * 3600, 10)).toBeGreaterThan((7 / 8) * 100);
  });

  it('falls steadily with temperature, and 85 °F sits on the even run from 80 to 90 °F', () => {
    for (let i = 1; i < CAPACITY_FACTOR_FROM_MEMORY.length; i++) {
      expect(CAPACITY_FACTOR_FROM_MEMORY[i]![1]).toBeLessThan(CAPACITY_FACTOR_FROM_MEMORY[i - 1]![1]);
    }
    const at = (f: number) => CAPACITY_FACTOR_FROM_MEMORY.find(([ff]) => ff === f)![1];
    expect(at(85)).toBeCloseTo((at(80) + at(90)) / 2, 9);
  });

  it('refuses temperatures outside its table, and says which are inside', () => {
    expect(() => capacityFactorTo25C(-20)).toThrow(RangeError);
    expect(inCapacityFactorRange(-20)).toBe(false);
    expect(inCapacityFactorRange((40 - 32) / 1.8)).toBe(true);
    expect(() => capacityFactorTo25C((40 - 32) / 1.8)).not.toThrow();
  });
});
