import type { Verdict } from '../../../../shared/schemas/run-summary';
import { RUN_STATE_COLORS } from '../../../lib/palette';

const VERDICT = {
  pass: { label: 'Pass', color: RUN_STATE_COLORS.recording },
  fail: { label: 'Fail', color: RUN_STATE_COLORS.cutoff },
  unrated: { label: 'Unrated', color: RUN_STATE_COLORS.finished },
  incomplete: { label: 'Incomplete', color: RUN_STATE_COLORS.recovered },
} as const;

/** Pass / fail / unrated / incomplete in the run-state palette (pass = the "recording" green, fail = the cutoff red). */
export function VerdictBadge({ verdict, large }: { verdict: Verdict; large?: boolean }) {
  const v = VERDICT[verdict];
  return (
    <span className={`inline-block rounded-md px-2 font-bold text-white ${large ? 'py-1 text-2xl' : 'py-0.5 text-sm'}`} style={{ backgroundColor: v.color }}>
      {v.label}
    </span>
  );
}
