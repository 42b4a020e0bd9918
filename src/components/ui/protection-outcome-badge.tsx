import type { ProtectionResult } from '../../../shared/schemas/protection-check';
import { TONE_COLORS } from '../../lib/palette';

const OUTCOME = {
  pass: { label: 'Pass', color: TONE_COLORS.good },
  fail: { label: 'Fail', color: TONE_COLORS.fault },
  'not-reached': { label: 'Not reached', color: TONE_COLORS.over },
} as const;

/** A protection's pass / fail / not reached, in the palette's tones: one badge for the run page and the pack's record. */
export function ProtectionOutcomeBadge({ outcome }: { outcome: ProtectionResult['outcome'] }) {
  const o = OUTCOME[outcome];
  return (
    <span className="inline-block rounded-md px-2 py-0.5 font-bold text-on-tone" style={{ backgroundColor: o.color }}>
      {o.label}
    </span>
  );
}
