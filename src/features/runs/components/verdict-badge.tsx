import type { Verdict } from '../../../../shared/schemas/run-summary';
import { TONE_COLORS } from '../../../lib/palette';

const VERDICT = {
  pass: { label: 'Pass', color: TONE_COLORS.good },
  fail: { label: 'Fail', color: TONE_COLORS.fault },
  borderline: { label: 'Borderline', color: TONE_COLORS.caution },
  unrated: { label: 'Unrated', color: TONE_COLORS.over },
  incomplete: { label: 'Incomplete', color: TONE_COLORS.caution },
  'not-applicable': { label: 'No capacity verdict', color: TONE_COLORS.over },
} as const;

/** Pass / fail / borderline / unrated / incomplete in the palette's tones (good, fault, caution, over, caution), text in the theme's on-tone colour. */
export function VerdictBadge({ verdict, large }: { verdict: Verdict; large?: boolean }) {
  const v = VERDICT[verdict];
  return (
    <span className={`inline-block rounded-md px-2 font-bold text-on-tone ${large ? 'py-1 text-2xl' : 'py-0.5 text-sm'}`} style={{ backgroundColor: v.color }}>
      {v.label}
    </span>
  );
}

/** A protection check's result in one badge: how many protections passed, failed or were not reached. */
export function ProtectionsBadge({ results }: { results: readonly { outcome: 'pass' | 'fail' | 'not-reached' }[] }) {
  const count = (o: string) => results.filter((r) => r.outcome === o).length;
  const failed = count('fail');
  const parts = [`${count('pass')} pass`, failed > 0 ? `${failed} fail` : null, count('not-reached') > 0 ? `${count('not-reached')} not reached` : null].filter(Boolean);
  return (
    <span className="inline-block rounded-md px-2 py-0.5 text-sm font-bold text-on-tone" style={{ backgroundColor: failed > 0 ? TONE_COLORS.fault : TONE_COLORS.good }}>
      Protections: {parts.join(', ')}
    </span>
  );
}
