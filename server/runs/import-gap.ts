import { DEFAULT_MAX_GAP_SECONDS } from '../../shared/measure/integrator.js';

/**
 * A step this many times the file's median interval is a gap: a logger's own jitter stays
 * well inside it, a missed reading or two is still integrated, a real hole is not.
 */
export const IMPORT_GAP_FACTOR = 5;

/**
 * The gap limit for an imported log, judged against its own cadence (median interval ×
 * IMPORT_GAP_FACTOR), never tighter than the live default, so 1 s, 60 s and 300 s logs
 * integrate across every ordinary step.
 */
export function importGapSeconds(medianStepS: number | null): number {
  return medianStepS === null ? DEFAULT_MAX_GAP_SECONDS : Math.max(DEFAULT_MAX_GAP_SECONDS, medianStepS * IMPORT_GAP_FACTOR);
}
