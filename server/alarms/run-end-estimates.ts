import { nominalWh } from '../../shared/measure/nominal.js';
import { EndEstimator } from '../../shared/measure/time-to-end.js';
import type { MeasureConfig } from '../../shared/schemas/measure-config.js';
import type { Reading } from '../../shared/schemas/reading.js';
import type { RunKind } from '../../shared/schemas/run.js';
import { SECONDS_PER_MINUTE } from '../../shared/units/time.js';


/** What the estimate needs to know of a live run: its kind and its measure config (rating, chemistry). */
export interface RunEstimateFacts {
  kind: RunKind;
  config: Pick<MeasureConfig, 'chemistry' | 'cellsInSeries' | 'ratedAh' | 'ratedWh'>;
}

/** The pack's rated energy as the live screens take it: stated Wh, else rated Ah × the chemistry's nominal volts. */
export function ratedWhOfConfig(config: RunEstimateFacts['config']): number | null {
  return config.ratedWh ?? nominalWh(config.chemistry ?? null, config.cellsInSeries ?? null, config.ratedAh ?? null);
}

/**
 * The time to the end voltage of each live discharge, kept up to date from the recorder's
 * readings with the same estimator the live page and the board show (shared/measure/
 * time-to-end.ts), so the near-end alarm fires on the number people see. A charge run, or a
 * run the recorder no longer knows, has no estimate.
 */
export class RunEndEstimates {
  private readonly runs = new Map<number, { estimator: EndEstimator; minutes: number | null }>();

  constructor(private readonly factsOf: (runId: number) => RunEstimateFacts | null) {}

  /** Sink: one reading of a live run. Register it before the alarm service's own reading sink. */
  onReading(runId: number, reading: Reading): void {
    let entry = this.runs.get(runId);
    if (!entry) {
      const facts = this.factsOf(runId);
      if (!facts || facts.kind === 'charge') return;
      entry = { estimator: new EndEstimator(ratedWhOfConfig(facts.config)), minutes: null };
      this.runs.set(runId, entry);
    }
    const estimate = entry.estimator.push({ elapsedSeconds: reading.elapsedSeconds, volts: reading.volts, amps: reading.amps, dischargeWh: reading.dischargeWh });
    entry.minutes = estimate.secondsToEnd === null ? null : estimate.secondsToEnd / SECONDS_PER_MINUTE;
  }

  /** Minutes to the end voltage of a run now, or null when it cannot be estimated. */
  minutesToEnd(runId: number): number | null {
    return this.runs.get(runId)?.minutes ?? null;
  }

  /** Forgets a run that ended. */
  forget(runId: number): void {
    this.runs.delete(runId);
  }
}
