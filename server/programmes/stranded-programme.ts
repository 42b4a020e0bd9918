import type { RunProgramme } from '../../shared/schemas/programme-run.js';
import type { ProgrammeStepEvent } from '../../shared/schemas/run-event.js';
import type { BenchInstrumentsProvider } from '../control/bench-instruments.js';
import { outputsOffChecked, reasonOf } from '../control/step-actions.js';

/** The first words of the reason a programme stranded by a server stop fails with. */
export const STRANDED_REASON = 'the server stopped while the programme ran';
/** The longest reason a run event holds (its schema's limit). */
const MAX_REASON_CHARS = 500;

/** What switching a stranded programme's bench off found. */
export interface StrandedOutcome {
  /** True only when every instrument of the bench read its output back off. */
  confirmedOff: boolean;
  /** The failure reason: the stop, then what each instrument said. */
  reason: string;
}

/**
 * Switches the outputs of a stranded programme's bench off through the same commands the
 * safety net sends, and says for each instrument whether it read back off or could not be
 * reached. Never throws: an instrument that is missing is part of the outcome.
 */
export async function switchOffStranded(provider: BenchInstrumentsProvider | undefined, benchId: number | null): Promise<StrandedOutcome> {
  const outcome = (confirmedOff: boolean, found: string): StrandedOutcome => ({ confirmedOff, reason: `${STRANDED_REASON}; at restart ${found}`.slice(0, MAX_REASON_CHARS) });
  if (benchId === null || !provider) return outcome(false, 'no instrument of the bench could be reached, outputs not confirmed off');
  try {
    const { instruments, unreachable } = provider.forBenchEach ? await provider.forBenchEach(benchId) : { instruments: await provider.forBench(benchId), unreachable: [] };
    if (!instruments?.load && !instruments?.supply && unreachable.length === 0) return outcome(false, 'the bench has no controllable instrument any more, outputs not confirmed off');
    const checks = instruments ? await outputsOffChecked(instruments) : [];
    // A bench with an instrument missing is opened afresh by the next programme.
    if (unreachable.length > 0) await provider.forget?.(benchId).catch(() => undefined);
    const missing = unreachable.map((u) => `${u.id}: could not be reached (${u.problem}), output not confirmed off`);
    return outcome(unreachable.length === 0 && checks.every((c) => c.confirmedOff), [...missing, ...checks.map((c) => c.detail)].join('; '));
  } catch (error) {
    return outcome(false, `the bench's instruments could not be reached (${reasonOf(error)}), outputs not confirmed off`);
  }
}

/**
 * The `fail` step event a stranded programme leaves on its run's timeline (the alarm sink raises
 * programme-failed from it). `atSeconds` is the run's elapsed time at the last reading recorded.
 */
export function strandedFailEvent(stored: RunProgramme | null, atSeconds: number, outcome: StrandedOutcome): ProgrammeStepEvent {
  const index = stored?.currentIndex ?? 0;
  return {
    type: 'programme-step', elapsedSeconds: atSeconds, phase: 'fail', index, label: stored?.stepLabels[index] ?? '',
    reason: outcome.reason, outputsConfirmedOff: outcome.confirmedOff,
  };
}
