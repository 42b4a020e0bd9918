import type { ColumnPlan } from './import-headers.js';
import type { SignDecision } from './import-sign.js';
import type { DuplicateTimes } from './import-survey.js';
import { TIME_FORMAT_WORDS } from './import-time.js';

/** What the importer decided for one file. */
export interface ImportDecisions {
  plan: ColumnPlan;
  sign: SignDecision;
  duplicates: DuplicateTimes;
  medianStepSeconds: number | null;
  maxGapSeconds: number;
  gapsFromForm: boolean;
}

const DEGREES = { C: '°C', F: '°F', K: 'K' } as const;
const TIME_SOURCE = { header: 'as its header says', chosen: 'as chosen', inferred: 'recognised from its values' } as const;
const TEMP_SOURCE = { header: 'as its header says', chosen: 'as chosen', lab: "the lab's unit, as the header names none" } as const;

/** The import's decisions and assumptions in words, so nothing is taken silently. */
export function importNotices(d: ImportDecisions): string[] {
  const out: string[] = [];
  const t = d.plan.time;
  out.push(`Time column "${t.column}" read as ${TIME_FORMAT_WORDS[t.format]} (${TIME_SOURCE[t.source]}).`);
  if (t.source === 'inferred' && t.format === 's') out.push(`The time column names no unit: if it counts minutes or milliseconds, import again choosing that format.`);
  const temp = d.plan.temp;
  if (temp) out.push(`Temperature column "${temp.column}" read in ${DEGREES[temp.unit]} (${TEMP_SOURCE[temp.source]}).`);
  out.push(`Current sign: ${d.sign.reason}.`);
  if (d.duplicates.count > 0) {
    const more = d.duplicates.count > d.duplicates.lines.length ? ' and others' : '';
    out.push(`${d.duplicates.count} row(s) repeat the time of the row before (line ${d.duplicates.lines.join(', ')}${more}); the first reading at each time is kept, the repeats are not integrated.`);
  }
  if (d.medianStepSeconds !== null) {
    out.push(`Readings every ${d.medianStepSeconds} s (median); a step longer than ${d.maxGapSeconds} s is a gap${d.gapsFromForm ? ' (as chosen)' : ''}, not integrated across.`);
  }
  return out;
}
