/**
 * The conditions a capacity figure was measured under, against the ones the standard rates
 * capacity at. IEC 61960-3 rates a lithium cell's or battery's capacity on a 0.2 It A
 * discharge (0.2 C) at 20 ± 5 °C (from memory; clause not checked against a published copy).
 */

/** The standard's discharge rate, C (0.2 It A). */
export const STANDARD_RATE_C = 0.2;
/** A mean rate further than this share from the standard's is flagged (our tolerance, not the standard's). */
export const RATE_TOLERANCE_SHARE = 0.1;
/** The standard's test temperature, °C. */
export const STANDARD_TEMP_CELSIUS = 20;
/** …and its tolerance either side, °C. */
export const STANDARD_TEMP_TOLERANCE_CELSIUS = 5;

/** Whether a run's rate and temperature lie outside the standard's (null when not known). */
export interface TestConditionFlags {
  rateOutsideStandard: boolean | null;
  tempOutsideStandard: boolean | null;
}

/** Flags a mean C-rate off 0.2 C by more than 10 %, and any temperature under load outside 15-25 °C. */
export function testConditionFlags(cRate: number | null, minTempCelsius: number | null, maxTempCelsius: number | null): TestConditionFlags {
  const rateOutsideStandard = cRate === null ? null : Math.abs(cRate - STANDARD_RATE_C) > STANDARD_RATE_C * RATE_TOLERANCE_SHARE;
  const low = STANDARD_TEMP_CELSIUS - STANDARD_TEMP_TOLERANCE_CELSIUS;
  const high = STANDARD_TEMP_CELSIUS + STANDARD_TEMP_TOLERANCE_CELSIUS;
  const tempOutsideStandard = minTempCelsius === null || maxTempCelsius === null ? null : minTempCelsius < low || maxTempCelsius > high;
  return { rateOutsideStandard, tempOutsideStandard };
}
