import type { ProtectionExpectation, ProtectionRequest, ProtectionSpec } from '../../shared/schemas/protection-check.js';
import { PROTECTION_TRAITS, ProtectionRequestSchema } from '../../shared/schemas/protection-check.js';

/** A protection asked for on a run with no threshold typed and none in the pack's record. */
export class MissingProtectionThresholdError extends Error {
  constructor(readonly protections: string[]) {
    super(`No expected threshold for ${protections.map((p) => PROTECTION_TRAITS[p as keyof typeof PROTECTION_TRAITS].label.toLowerCase()).join(', ')}: type one on the run or add it to the pack's record`);
  }
}

/**
 * The protections a protection check times, resolved once when the run starts so the run
 * keeps them even if the pack's record changes later: what was typed on the run wins, a
 * field left out comes from the pack's record; no list on the run = every protection the
 * record states.
 */
export function resolveProtectionChecks(requested: readonly ProtectionRequest[], specs: readonly ProtectionSpec[]): ProtectionExpectation[] {
  const bySpec = new Map(specs.map((s) => [s.protection, s]));
  if (requested.length === 0) return specs.map((s) => ({ ...s, channel: null }));
  const missing: string[] = [];
  const out: ProtectionExpectation[] = [];
  for (const raw of requested) {
    const r = ProtectionRequestSchema.parse(raw);
    const spec = bySpec.get(r.protection);
    const thresholdValue = r.thresholdValue ?? spec?.thresholdValue;
    if (thresholdValue === undefined) {
      missing.push(r.protection);
      continue;
    }
    out.push({
      protection: r.protection, thresholdValue, channel: r.channel,
      delaySeconds: r.delaySeconds ?? spec?.delaySeconds ?? null,
      releaseValue: r.releaseValue ?? spec?.releaseValue ?? null,
      thresholdTolerance: r.thresholdTolerance ?? spec?.thresholdTolerance ?? null,
      delayToleranceSeconds: r.delayToleranceSeconds ?? spec?.delayToleranceSeconds ?? null,
    });
  }
  if (missing.length > 0) throw new MissingProtectionThresholdError(missing);
  return out;
}
