import { z } from 'zod';

/**
 * Sign convention, written once for the whole product: positive amps = discharge
 * (current leaving the battery into a load); negative amps = charge.
 */
export const DISCHARGE_POSITIVE = true as const;

/** How a frame got its timestamp: the meter's own clock, or stamped when it arrived. */
export const ClockSourceSchema = z.enum(['device', 'arrival']);

/**
 * One meter reading as it comes off a source, before integration.
 * `t` is in seconds on the source's clock (device seconds, or Unix seconds on arrival);
 * only differences of `t` matter to the measurement core.
 */
export const FrameSchema = z.object({
  t: z.number().finite(),
  volts: z.number().finite(),
  amps: z.number().finite(),
  /** Temperatures in °C by channel name (for example `cell`, `ambient`, `sensor1`). */
  temps: z.record(z.string(), z.number().finite()).optional(),
  /** Auxiliary channels by name; `heaterAmps` is the heater-pad current in A. */
  aux: z.record(z.string(), z.number().finite()).optional(),
  clock: ClockSourceSchema.default('arrival'),
  /** Source sequence number when the meter provides one. */
  seq: z.number().int().nonnegative().optional(),
});

export type Frame = z.infer<typeof FrameSchema>;
export type FrameInput = z.input<typeof FrameSchema>;
export const HEATER_AMPS_CHANNEL = 'heaterAmps';
