import type { Verdict } from '../../../../shared/schemas/run-summary';
import { TONE_COLORS } from '../../../lib/palette';

const VERDICT = {
  pass: { label: 'Pass', color: TONE_COLORS.good },
  fail: { label: 'Fail', color: TONE_COLORS.fault },
  unrated: { label: 'Unrated', color: TONE_COLORS.over },
  'not-applicable': { label: 'No capacity verdict', color: TONE_COLORS.over },
} as const;

/** Pass / fail / unrated in the palette's tones (good, fault, over), text in the theme's on-tone colour. */
export function VerdictBadge({ verdict, large }: { verdict: Verdict; large?: boolean }) {
  const v = VERDICT[verdict];
  return (
    <span className={`inline-block rounded-md px-2 font-bold text-on-tone ${large ? 'py-1 text-2xl' : 'py-0.5 text-sm'}`} style={{ backgroundColor: v.color }}>
      {v.label}
    </span>
  );
}
