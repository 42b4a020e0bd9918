import type { z } from 'zod';
import type { GapLimitBasisSchema } from '../schemas/run-summary.js';

/**
 * The gap limit: how long a source may stay silent before the integrator stops drawing a
 * straight line across the silence. It is judged against the source's own cadence, not a
 * fixed number, so a meter polled every minute or a log written every five minutes
 * integrates, while a real hole in a one-second log is still a gap.
 */

/** Limit when neither an explicit value nor the source's cadence is known, s. */
export const DEFAULT_MAX_GAP_SECONDS = 30;
/**
 * Default gap factor: a step longer than this many cadences is a gap. With 3, two missed
 * readings in a row (a step of 3 cadences) are still integrated; a third makes a gap.
 */
export const DEFAULT_GAP_FACTOR = 3;
/**
 * The cadence-derived limit is never tighter than this, s: a server pausing a fraction of a
 * second (garbage collection, a busy disk) must not break the integration of a fast-polled meter.
 */
export const MIN_GAP_SECONDS = 2;

/** Where the limit came from: typed on the run or import, the source's cadence × factor, or the default. */
export type GapLimitBasis = z.infer<typeof GapLimitBasisSchema>;

/** The gap limit in force and how it was decided. */
export interface GapLimit {
  seconds: number;
  basis: GapLimitBasis;
  /** The cadence it was derived from (null unless basis = cadence). */
  cadenceSeconds: number | null;
  factor: number;
}

/** What the limit is decided from (a MeasureConfig fits). */
export interface GapLimitInput {
  /** An explicit limit: wins over everything else. */
  maxGapSeconds?: number;
  /** The source's own interval between readings: the poll period, or a log's median interval. */
  cadenceSeconds?: number;
  gapFactor?: number;
}

/**
 * Resolves the gap limit: an explicit `maxGapSeconds` as given; else `gapFactor` ×
 * `cadenceSeconds` (not below MIN_GAP_SECONDS); else DEFAULT_MAX_GAP_SECONDS.
 */
export function resolveGapLimit(input: GapLimitInput): GapLimit {
  const factor = input.gapFactor ?? DEFAULT_GAP_FACTOR;
  if (input.maxGapSeconds !== undefined) return { seconds: input.maxGapSeconds, basis: 'explicit', cadenceSeconds: null, factor };
  const cadence = input.cadenceSeconds;
  if (cadence !== undefined && Number.isFinite(cadence) && cadence > 0)
    return { seconds: Math.max(cadence * factor, MIN_GAP_SECONDS), basis: 'cadence', cadenceSeconds: cadence, factor };
  return { seconds: DEFAULT_MAX_GAP_SECONDS, basis: 'default', cadenceSeconds: null, factor };
}
