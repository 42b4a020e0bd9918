import { z } from 'zod';

/** Largest gain a data sheet may state, % of reading (beyond this it is no meter accuracy). */
const MAX_GAIN_PERCENT = 50;
/** Largest offset a data sheet may state, in the quantity's unit (V or A). */
const MAX_OFFSET = 1000;

const gainPercent = z.number().finite().nonnegative().max(MAX_GAIN_PERCENT);
const offset = z.number().finite().nonnegative().max(MAX_OFFSET);

/**
 * A bench meter's stated accuracy, typed from its data sheet as ±(% of reading + offset)
 * for volts and for amps, e.g. ±(0.1 % + 0.01 V) and ±(0.2 % + 0.02 A). These are limits
 * (half-widths), not standard uncertainties: the uncertainty code divides them by √3.
 */
export const MeterAccuracySchema = z.object({
  voltsGainPercent: gainPercent,
  voltsOffsetVolts: offset,
  ampsGainPercent: gainPercent,
  ampsOffsetAmps: offset,
});
export type MeterAccuracy = z.infer<typeof MeterAccuracySchema>;

/** Reads a stored meter accuracy; a missing or no longer valid one is "not stated". */
export function readMeterAccuracy(text: string | null | undefined): MeterAccuracy | null {
  if (!text) return null;
  try {
    return MeterAccuracySchema.safeParse(JSON.parse(text)).data ?? null;
  } catch {
    return null;
  }
}

/** The method the uncertainty figures are computed by, named in the summary and reports. */
export const UNCERTAINTY_METHOD = 'JCGM 100:2008 (GUM) law of propagation, Type B rectangular, gain and offset each fully correlated, k = 2';

/** Uncertainty of a run's delivered capacity (see shared/measure/uncertainty.ts). */
export const CapacityUncertaintySchema = z.object({
  method: z.string(),
  coverageFactor: z.number().finite().positive(),
  /** Combined standard uncertainty u and expanded uncertainty U = k·u of the capacity, Ah. */
  standardAh: z.number().finite().nonnegative(),
  expandedAh: z.number().finite().nonnegative(),
  /** The same for Wh (null when the capacity Wh is not known). */
  standardWh: z.number().finite().nonnegative().nullable(),
  expandedWh: z.number().finite().nonnegative().nullable(),
  /** The meter accuracy it was computed from. */
  accuracy: MeterAccuracySchema,
});
export type CapacityUncertainty = z.infer<typeof CapacityUncertaintySchema>;
