import { z } from 'zod';

const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/**
 * The protections a protection check can time. Each one has a signal (a temperature channel,
 * the pack volts, or the discharge amps), a side of its threshold where it acts, and the
 * current it stops (charge, discharge, or the heater's own current).
 */
export const PROTECTIONS = [
  'cold-charge', 'heater-on', 'heater-off', 'over-temp-charge', 'over-temp-discharge', 'low-voltage', 'high-voltage', 'over-current',
] as const;
export const ProtectionSchema = z.enum(PROTECTIONS);
export type Protection = z.infer<typeof ProtectionSchema>;

/** What a protection watches and which way it trips. */
export interface ProtectionTraits {
  signal: 'temperature' | 'volts' | 'amps';
  /** The protection acts when the signal goes below (or above) the threshold. */
  direction: 'below' | 'above';
  /** The current it stops (heater checks: the heater's own current starts or stops). */
  stops: 'charge' | 'discharge' | 'heater';
  unit: '°C' | 'V' | 'A';
  label: string;
}

/** One place that says what each protection means. */
export const PROTECTION_TRAITS: Readonly<Record<Protection, ProtectionTraits>> = {
  'cold-charge': { signal: 'temperature', direction: 'below', stops: 'charge', unit: '°C', label: 'Cold-charge inhibit' },
  'heater-on': { signal: 'temperature', direction: 'below', stops: 'heater', unit: '°C', label: 'Heater on' },
  'heater-off': { signal: 'temperature', direction: 'above', stops: 'heater', unit: '°C', label: 'Heater off' },
  'over-temp-charge': { signal: 'temperature', direction: 'above', stops: 'charge', unit: '°C', label: 'Over-temperature, charging' },
  'over-temp-discharge': { signal: 'temperature', direction: 'above', stops: 'discharge', unit: '°C', label: 'Over-temperature, discharging' },
  'low-voltage': { signal: 'volts', direction: 'below', stops: 'discharge', unit: 'V', label: 'Low-voltage cutoff' },
  'high-voltage': { signal: 'volts', direction: 'above', stops: 'charge', unit: 'V', label: 'High-voltage cutoff' },
  'over-current': { signal: 'amps', direction: 'above', stops: 'discharge', unit: 'A', label: 'Over-current' },
};

/**
 * Default tolerances, stated with every result: ±2 °C on a temperature threshold, ±2 % on a
 * voltage or current threshold, and on a delay ±(1 s + 10 % of the expected delay). A run or a
 * pack's record may state its own.
 */
export const DEFAULT_TOLERANCE = { celsius: 2, relative: 0.02, delaySeconds: 1, delayRelative: 0.1 } as const;

/** A pack's expected behaviour for one protection (what its maker states): threshold in °C, V (pack) or A. */
export const ProtectionSpecSchema = z.object({
  protection: ProtectionSchema,
  thresholdValue: finite,
  /** Time the protection takes to act once the threshold is passed, s; null = not stated. */
  delaySeconds: nonNeg.nullable().default(null),
  /** Value at which it lets current flow again (°C, V, A); null = not stated. */
  releaseValue: finite.nullable().default(null),
  /** Allowed difference on the threshold (unit of the threshold); default DEFAULT_TOLERANCE. */
  thresholdTolerance: nonNeg.nullable().default(null),
  /** Allowed difference on the delay, s; default DEFAULT_TOLERANCE. */
  delayToleranceSeconds: nonNeg.nullable().default(null),
});
export type ProtectionSpec = z.infer<typeof ProtectionSpecSchema>;
export type ProtectionSpecInput = z.input<typeof ProtectionSpecSchema>;

/** A protection to check on a run: the pack's spec, with the temperature channel to watch. */
export const ProtectionExpectationSchema = ProtectionSpecSchema.extend({
  /** Temperature channel (the bench's label, e.g. `cell`); default the first channel the source reports. */
  channel: z.string().min(1).max(64).nullable().default(null),
});
export type ProtectionExpectation = z.infer<typeof ProtectionExpectationSchema>;

/** What a technician types on the start form: a threshold left out comes from the pack's record. */
export const ProtectionRequestSchema = ProtectionExpectationSchema.extend({ thresholdValue: finite.optional() });
export type ProtectionRequest = z.input<typeof ProtectionRequestSchema>;

/** pass/fail against the tolerance; `not-reached` = the signal never got past the threshold (nothing tested). */
export const ProtectionOutcomeSchema = z.enum(['pass', 'fail', 'not-reached']);

/** The stretch of the run that shows one protection acting, in run seconds. */
export const RunWindowSchema = z.object({ fromSeconds: finite, toSeconds: finite });

/** One row of a protection check's table: expected against measured. Null = not measured. */
export const ProtectionResultSchema = z.object({
  protection: ProtectionSchema,
  unit: z.enum(['°C', 'V', 'A']),
  channel: z.string().nullable(),
  expectedValue: finite,
  expectedDelaySeconds: nonNeg.nullable(),
  expectedReleaseValue: finite.nullable(),
  thresholdTolerance: nonNeg,
  delayToleranceSeconds: nonNeg,
  /** The signal at the last reading before the current stopped (or the heater switched). */
  measuredValue: finite.nullable(),
  /** From the first reading past the threshold to the first reading with the current stopped. */
  measuredDelaySeconds: nonNeg.nullable(),
  /** The signal at the first reading with current flowing again. */
  releaseValue: finite.nullable(),
  /** From the trip to the first reading with current flowing again. */
  resumeSeconds: nonNeg.nullable(),
  /** The pack was already past the threshold at the first reading (the threshold itself is then not measured). */
  beyondAtStart: z.boolean(),
  /** Heater checks: mean and peak heater current while on (PWM off slots included in the mean). */
  meanHeaterAmps: finite.nullable(),
  peakHeaterAmps: finite.nullable(),
  trips: z.number().int().nonnegative(),
  outcome: ProtectionOutcomeSchema,
  /** Why it failed or what was not measured, in words. */
  notes: z.array(z.string()),
  window: RunWindowSchema.nullable(),
});
export type ProtectionResult = z.infer<typeof ProtectionResultSchema>;

/** Tolerance on a threshold actually applied: the stated one, else the default for its unit. */
export function thresholdToleranceOf(spec: Pick<ProtectionSpec, 'protection' | 'thresholdValue' | 'thresholdTolerance'>): number {
  if (spec.thresholdTolerance !== null) return spec.thresholdTolerance;
  return PROTECTION_TRAITS[spec.protection].signal === 'temperature' ? DEFAULT_TOLERANCE.celsius : Math.abs(spec.thresholdValue) * DEFAULT_TOLERANCE.relative;
}

/** Tolerance on a delay actually applied: the stated one, else 1 s + 10 % of the expected delay. */
export function delayToleranceOf(spec: Pick<ProtectionSpec, 'delaySeconds' | 'delayToleranceSeconds'>): number {
  if (spec.delayToleranceSeconds !== null) return spec.delayToleranceSeconds;
  return DEFAULT_TOLERANCE.delaySeconds + (spec.delaySeconds ?? 0) * DEFAULT_TOLERANCE.delayRelative;
}

/** One row of a pack's protection record: a protection checked on one run. */
export const ProtectionRecordRowSchema = ProtectionResultSchema.extend({
  runId: z.number().int(),
  runName: z.string(),
  runState: z.string(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
});
export type ProtectionRecordRow = z.infer<typeof ProtectionRecordRowSchema>;

/** GET /api/batteries/:id/protections: every protection checked across the pack's runs, latest run first. */
export const ProtectionRecordResponseSchema = z.object({
  batteryId: z.number().int(),
  /** The pack's stated protections (its record), for comparison. */
  specs: z.array(ProtectionSpecSchema),
  rows: z.array(ProtectionRecordRowSchema),
});
export type ProtectionRecordResponse = z.infer<typeof ProtectionRecordResponseSchema>;
