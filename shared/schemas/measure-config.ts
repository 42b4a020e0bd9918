import { z } from 'zod';
import { ChemistrySchema } from './chemistry.js';
import { ProtectionExpectationSchema } from './protection-check.js';

const pos = z.number().finite().positive();
const nonNeg = z.number().finite().nonnegative();

/** A temperature protection to time: limit crossed → current ≈ 0 A. */
export const TempProtectionSchema = z.object({
  kind: z.enum(['low-temp-charge', 'high-temp-charge', 'high-temp-discharge', 'high-temp', 'low-temp']),
  /** Temperature channel name in Frame.temps. */
  channel: z.string().min(1),
  limitCelsius: z.number().finite(),
  /** Trips when the temperature goes below (cold limits) or above (hot limits) the limit. */
  direction: z.enum(['below', 'above']),
  /** Which current the protection stops. */
  current: z.enum(['charge', 'discharge', 'any']).default('any'),
});
export type TempProtection = z.infer<typeof TempProtectionSchema>;

/**
 * Everything the run pipeline (integrator + detector) needs to know about a run.
 * End voltage: `endVolts` (absolute) wins over `endVoltsPerCell × cellsInSeries`.
 * Defaults are conservative; every threshold is in the unit its name says.
 */
export const MeasureConfigSchema = z.object({
  chemistry: ChemistrySchema.optional(),
  cellsInSeries: z.number().int().positive().optional(),
  endVolts: pos.optional(),
  endVoltsPerCell: pos.optional(),
  ratedAh: pos.optional(),
  ratedWh: pos.optional(),
  /** Source-clock t taken as the run's origin; default: the first accepted frame. */
  originT: z.number().finite().optional(),
  /** No integration across a step in t longer than this; a gap event instead. */
  maxGapSeconds: pos.default(30),
  /** |amps| at or below this counts as "about 0 A". */
  zeroAmps: nonNeg.default(0.05),
  /** Discharge current at or above this counts as "load on". */
  loadOnAmps: pos.default(0.2),
  /** Volts below this (absolute) count as a collapsed terminal voltage (protection open). */
  collapseVolts: nonNeg.default(1),
  /** Width of the hysteresis band on voltage thresholds, V; default 1 % of end volts. */
  hysteresisVolts: nonNeg.optional(),
  /** Consecutive readings a condition must hold before an event fires (noise rejection). */
  confirmReadings: z.number().int().positive().default(3),
  /** Early warning when volts fall below end volts + this margin; default 5 % of end volts. */
  warnMarginVolts: nonNeg.optional(),
  /** Recovery threshold after a protection cutoff; default the end voltage. */
  recoveryVolts: pos.optional(),
  tempProtections: z.array(TempProtectionSchema).default([]),
  /** Protections a protection check times against their expected threshold and delay. */
  protectionChecks: z.array(ProtectionExpectationSchema).default([]),
  /** Hysteresis on temperature limits: back inside only this far past the limit, °C. */
  tempHysteresisCelsius: nonNeg.default(1),
  /** Heater current above this turns the heater "on"; below heaterOffAmps "off". */
  heaterOnAmps: pos.default(0.5),
  heaterOffAmps: nonNeg.default(0.2),
  /** A heater reading low for no longer than this is in a PWM off slot, not switched off, s. */
  heaterPwmOffSeconds: nonNeg.default(5),
  /** Temperature channel reported with heater events; default the first channel present. */
  heaterTempChannel: z.string().min(1).optional(),
});

export type MeasureConfig = z.infer<typeof MeasureConfigSchema>;
export type MeasureConfigInput = z.input<typeof MeasureConfigSchema>;
