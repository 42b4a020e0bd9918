import { z } from 'zod';
import { FrameSchema } from './frame.js';

/** Running totals in one place so every consumer spells them the same way. */
export const RunTotalsSchema = z.object({
  /** Energy delivered by the battery (positive amps), Wh. */
  dischargeWh: z.number().finite().nonnegative(),
  /** Charge delivered by the battery (positive amps), Ah. */
  dischargeAh: z.number().finite().nonnegative(),
  /** Energy put into the battery (negative amps), Wh, as a positive number. */
  chargeWh: z.number().finite().nonnegative(),
  /** Charge put into the battery (negative amps), Ah, as a positive number. */
  chargeAh: z.number().finite().nonnegative(),
});

export type RunTotals = z.infer<typeof RunTotalsSchema>;

/**
 * A Frame after the measurement core has seen it: the frame itself (source clock `t`
 * unchanged), seconds since the run started, instantaneous watts (volts × amps, positive
 * = discharge) and the running totals up to and including this reading.
 */
export const ReadingSchema = FrameSchema.extend({
  /** Seconds since the run's origin (the first accepted frame unless configured). */
  elapsedSeconds: z.number().finite(),
  watts: z.number().finite(),
}).extend(RunTotalsSchema.shape);

export type Reading = z.infer<typeof ReadingSchema>;
