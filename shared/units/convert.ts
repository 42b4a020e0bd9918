import { SECONDS_PER_HOUR } from './time.js';

/** °F at 0 °C (definition of the Fahrenheit scale). */
const FAHRENHEIT_ZERO_OFFSET = 32;
/** °F per °C (definition of the Fahrenheit scale). */
const FAHRENHEIT_PER_CELSIUS = 9 / 5;
/** K at 0 °C (SI definition). */
const KELVIN_AT_ZERO_CELSIUS = 273.15;
const KILO = 1000;
const MILLI_PER_UNIT = 1000;

/** °C → °F. */
export function celsiusToFahrenheit(celsius: number): number {
  return celsius * FAHRENHEIT_PER_CELSIUS + FAHRENHEIT_ZERO_OFFSET;
}

/** °F → °C. */
export function fahrenheitToCelsius(fahrenheit: number): number {
  return (fahrenheit - FAHRENHEIT_ZERO_OFFSET) / FAHRENHEIT_PER_CELSIUS;
}

/** K → °C. */
export function kelvinToCelsius(kelvin: number): number {
  return kelvin - KELVIN_AT_ZERO_CELSIUS;
}

/** A temperature in °C from °C, °F or K: the one conversion every reader of logs and meters uses. */
export function toCelsius(value: number, unit: 'C' | 'F' | 'K'): number {
  if (unit === 'F') return fahrenheitToCelsius(value);
  if (unit === 'K') return kelvinToCelsius(value);
  return value;
}

/** Wh → J. */
export function whToJoules(wh: number): number {
  return wh * SECONDS_PER_HOUR;
}

/** J → Wh. */
export function joulesToWh(joules: number): number {
  return joules / SECONDS_PER_HOUR;
}

/** Wh → kWh. */
export function whToKWh(wh: number): number {
  return wh / KILO;
}

/** kWh → Wh. */
export function kWhToWh(kWh: number): number {
  return kWh * KILO;
}

/** Ah → mAh. */
export function ahToMah(ah: number): number {
  return ah * MILLI_PER_UNIT;
}

/** mAh → Ah. */
export function mahToAh(mah: number): number {
  return mah / MILLI_PER_UNIT;
}

/** Ah → coulombs (A·s). */
export function ahToCoulombs(ah: number): number {
  return ah * SECONDS_PER_HOUR;
}

/** Coulombs (A·s) → Ah. */
export function coulombsToAh(coulombs: number): number {
  return coulombs / SECONDS_PER_HOUR;
}

/** Watts from volts and amps (P = V·I; sign follows amps: positive = discharge). */
export function wattsFrom(volts: number, amps: number): number {
  return volts * amps;
}

/** Volts from watts and amps (V = P / I); NaN when amps is 0. */
export function voltsFrom(watts: number, amps: number): number {
  return amps === 0 ? Number.NaN : watts / amps;
}

/** Ah from Wh at a mean voltage (Ah = Wh / V); NaN when volts is 0. */
export function ahFromWh(wh: number, meanVolts: number): number {
  return meanVolts === 0 ? Number.NaN : wh / meanVolts;
}

/** Wh from Ah at a mean voltage (Wh = Ah · V). */
export function whFromAh(ah: number, meanVolts: number): number {
  return ah * meanVolts;
}
