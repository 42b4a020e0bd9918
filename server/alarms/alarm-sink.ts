import type { Reading } from '../../shared/schemas/reading.js';
import type { Run } from '../../shared/schemas/run.js';
import type { RunEvent } from '../../shared/schemas/run-event.js';
import type { AlarmService } from './alarm-service.js';
import { RunEndEstimates, type RunEstimateFacts } from './run-end-estimates.js';

/**
 * The alarms as a sink of a run's readings, events and state changes. Each list is handed
 * to the producer in order, one listener per function, so that one throwing stops no other.
 */
export interface AlarmSink {
  /** The time-to-end estimate first, then the alarm service, which reads it for the same reading. */
  readingListeners: readonly ((runId: number, reading: Reading) => void)[];
  eventListeners: readonly ((runId: number, event: RunEvent) => void)[];
  /** An ended run's estimate is forgotten before the service sees the end. */
  runChangeListeners: readonly ((run: Run) => void)[];
}

/**
 * The sink functions of the alarm service. The near-end alarm fires on the time to the end
 * voltage the live page shows: `factsOf` tells the estimate a live run's kind and config
 * (null when the producer no longer holds the run).
 */
export function alarmSink(service: AlarmService, factsOf: (runId: number) => RunEstimateFacts | null): AlarmSink {
  const estimates = new RunEndEstimates(factsOf);
  service.setEndEstimator((runId) => estimates.minutesToEnd(runId));
  return {
    readingListeners: [
      (runId, reading) => estimates.onReading(runId, reading),
      (runId, reading) => service.onReading(runId, reading),
    ],
    eventListeners: [(runId, event) => service.onRunEvent(runId, event)],
    runChangeListeners: [
      (run) => {
        if (run.state === 'finished' || run.state === 'aborted') estimates.forget(run.id);
      },
      (run) => service.onRunChange(run),
    ],
  };
}
