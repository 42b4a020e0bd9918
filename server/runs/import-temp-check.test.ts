import { describe, expect, it } from 'vitest';
import { checkAssumedTempUnit } from './import-temp-check.js';

const column = (unit: 'C' | 'F', source: 'header' | 'chosen' | 'lab') => ({ index: 3, unit, source, column: 'Temperature' });

describe("a temperature column read in the lab's unit", () => {
  it('refuses a °F room-temperature log assumed to be °C (77 read as 77 °C), and asks for the unit', () => {
    expect(() => checkAssumedTempUnit(column('C', 'lab'), 77)).toThrow(/names no unit and starts at 77.0 °C in the lab's unit, which fits °F better; choose the temperature unit/);
  });
  it('refuses a °C room-temperature log assumed to be °F (22 read as 22 °F)', () => {
    // 22 °F is -5.56 °C (scale definitions).
    expect(() => checkAssumedTempUnit(column('F', 'lab'), ((22 - 32) * 5) / 9)).toThrow(/starts at 22.0 °F .* fits °C better/);
  });
  it('takes plausible starts, and any start when the header or the form gave the unit', () => {
    expect(() => checkAssumedTempUnit(column('C', 'lab'), 23)).not.toThrow();
    expect(() => checkAssumedTempUnit(column('F', 'lab'), 23)).not.toThrow(); // 73.4 °F
    expect(() => checkAssumedTempUnit(column('C', 'header'), 77)).not.toThrow();
    expect(() => checkAssumedTempUnit(column('C', 'chosen'), 77)).not.toThrow();
  });
});
