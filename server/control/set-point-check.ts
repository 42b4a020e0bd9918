import type { z } from 'zod';
import type { SetPointLimitsSchema } from '../../shared/schemas/instrument-driver.js';
import type { SetPoint } from './instrument-control.js';

const UNIT = { cc: 'A', cp: 'W', cr: 'Ω', cv: 'V' } as const;

/**
 * Why a set point must not be sent (not finite, not positive, above the instrument's limit),
 * or undefined when it may. Checked before any byte goes out, so a bad value changes nothing.
 */
export function setPointProblem(point: SetPoint, limits: z.infer<typeof SetPointLimitsSchema>): string | undefined {
  const { mode, value } = point;
  if (!Number.isFinite(value) || value <= 0) return `${mode.toUpperCase()} value ${value} is not a positive number`;
  const limit = limits[mode];
  if (limit !== undefined && value > limit) return `${mode.toUpperCase()} ${value} ${UNIT[mode]} is above the instrument's limit of ${limit} ${UNIT[mode]}`;
  const amps = point.currentLimitAmps;
  if (amps !== undefined) {
    if (!Number.isFinite(amps) || amps <= 0) return `current limit ${amps} is not a positive number`;
    if (limits.cc !== undefined && amps > limits.cc) return `current limit ${amps} A is above the instrument's limit of ${limits.cc} A`;
  }
  return undefined;
}
