import { z } from 'zod';
import type { Reading } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import { LEGACY_RUN_TIME_KEYS, withCurrentKeys } from '../schemas/legacy-keys.js';
import type { DetectorSettings } from './detector-settings.js';
import { createCutoffState, detectCutoff, type CutoffState } from './detect-cutoff.js';
import { createMilestoneState, detectMilestones, type MilestoneState } from './detect-milestones.js';
import { createTempProtectionState, detectTempProtection, type TempProtectionState } from './detect-temp-protection.js';
import { createHeaterState, detectHeater, type HeaterState } from './detect-heater.js';
import { createProtectionCheckState, detectProtectionCheck, type ProtectionCheckState } from './detect-protection-check.js';

export { resolveDetectorSettings, resolveEndVolts, type DetectorSettings } from './detector-settings.js';
export { LOAD_ON_CHANNEL } from './detect-cutoff.js';

/** All detector state for one run, as a plain JSON-safe object. */
export interface DetectorState {
  version: 1;
  cutoff: CutoffState;
  milestones: MilestoneState;
  /** One entry per configured temperature protection, in config order. */
  tempProtections: TempProtectionState[];
  heater: HeaterState;
  /** One entry per protection check, in config order. */
  protectionChecks: ProtectionCheckState[];
}

/** Shape check for a restored detector state (the parts are checked by use; this catches a wrong or truncated blob). */
export const DetectorStateSchema = z.object({
  version: z.literal(1),
  // A state stored before the rename keeps run time as `t` and `cutoffT` (candidate, crossing point, cutoff). vocab-rename: keep
  cutoff: z.preprocess((v) => withCurrentKeys(v, LEGACY_RUN_TIME_KEYS), z.object({ phase: z.enum(['idle', 'discharging', 'cut-off']) }).loose()),
  milestones: z.object({ fired: z.array(z.string()), warned: z.boolean() }).loose(),
  tempProtections: z.array(z.object({ phase: z.enum(['watch', 'armed', 'tripped']) }).loose()),
  heater: z.object({ on: z.boolean() }).loose(),
  protectionChecks: z.array(z.object({ phase: z.enum(['start', 'watch', 'armed', 'tripped']) }).loose()).default([]),
});

/** A fresh detector state for the given settings. */
export function createDetectorState(k: DetectorSettings): DetectorState {
  return {
    version: 1,
    cutoff: createCutoffState(),
    milestones: createMilestoneState(),
    tempProtections: k.tempProtections.map(() => createTempProtectionState()),
    heater: createHeaterState(),
    protectionChecks: k.protectionChecks.map(() => createProtectionCheckState()),
  };
}

/**
 * Runs every detector over one reading (constant work per reading) and appends the
 * events it confirms to `out`. Each detector maps the reading to a zone and reports
 * only changes, with hysteresis and a confirmation count, so noise never chatters.
 */
export function detectStep(s: DetectorState, k: DetectorSettings, r: Reading, out: RunEvent[]): void {
  detectCutoff(s.cutoff, r, k, out);
  detectMilestones(s.milestones, r, k, out);
  for (let i = 0; i < k.tempProtections.length; i++) detectTempProtection(s.tempProtections[i]!, k.tempProtections[i]!, r, k, out);
  detectHeater(s.heater, r, k, out);
  for (let i = 0; i < k.protectionChecks.length; i++) detectProtectionCheck(s.protectionChecks[i]!, i, k.protectionChecks[i]!, r, k, out);
}
