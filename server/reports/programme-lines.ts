import type { RunProgramme } from '../../shared/schemas/programme-run.js';
import { formatCharge, formatDuration, formatEnergy, formatPercent, formatVolts } from '../../shared/units/format.js';

const PERCENT = 100;
const OUTCOME_WORD = { done: 'done', skipped: 'skipped', failed: 'failed safe', aborted: 'aborted' } as const;

/** The report's lines for a run's programme: its state, each step's figures and the round trips (the run page's words). */
export function programmeReportLines(p: RunProgramme): string[] {
  const lines = [`${p.programme.name}: ${p.state}${p.failReason ? ` (${p.failReason})` : ''}; cautions acknowledged by ${p.cautionsAcknowledgedBy}`];
  for (const r of p.results)
    lines.push(
      `${r.label}: ${OUTCOME_WORD[r.outcome]}, ${r.reason}; ${formatDuration(r.endElapsedSeconds - r.startElapsedSeconds)}; in ${formatCharge(r.chargeAh)}, ${formatEnergy(r.chargeWh)}; out ${formatCharge(r.dischargeAh)}, ${formatEnergy(r.dischargeWh)}; end ${formatVolts(r.endVolts, 3)}`,
    );
  for (const t of p.roundTrips)
    lines.push(`Round trip ${p.stepLabels[t.dischargeIndex]} to ${p.stepLabels[t.chargeIndex]}: energy ${formatPercent(t.energyEfficiency * PERCENT)}, charge ${formatPercent(t.coulombicEfficiency * PERCENT)}`);
  return lines;
}
