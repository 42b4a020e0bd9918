import { InvalidInputError } from '../domain/domain-errors.js';
import type { ColumnPlan } from './import-headers.js';

/**
 * Warmest first reading taken as °C when the unit was only assumed: packs start a test near
 * room temperature (IEC 61960-3 rates capacity at 20 ± 5 °C, from memory), and 45 °C and up is
 * where a room-temperature log in °F sits (59-95 °F).
 */
export const MAX_ASSUMED_START_CELSIUS = 45;
/** Coldest first reading taken as °F when assumed: below 41 °F (5 °C) a room-temperature log in °C sits (15-35). */
export const MIN_ASSUMED_START_FAHRENHEIT = 41;
const FAHRENHEIT = (celsius: number) => (celsius * 9) / 5 + 32;

/**
 * Refuses a temperature column read in the lab's unit (its header names none) when its first
 * reading fits the other unit far better: °F never read as °C, or °C as °F, without a word.
 * A unit from the header or chosen on the form is taken as given.
 */
export function checkAssumedTempUnit(temp: NonNullable<ColumnPlan['temp']>, firstCelsius: number): void {
  if (temp.source !== 'lab') return;
  const ask = (shown: string, other: string) =>
    new InvalidInputError(`Temperature column "${temp.column}" names no unit and starts at ${shown} in the lab's unit, which fits ${other} better; choose the temperature unit`, { tempUnit: ['choose the unit'] });
  if (temp.unit === 'C' && firstCelsius >= MAX_ASSUMED_START_CELSIUS) throw ask(`${firstCelsius.toFixed(1)} °C`, '°F');
  if (temp.unit === 'F' && FAHRENHEIT(firstCelsius) < MIN_ASSUMED_START_FAHRENHEIT) throw ask(`${FAHRENHEIT(firstCelsius).toFixed(1)} °F`, '°C');
}
