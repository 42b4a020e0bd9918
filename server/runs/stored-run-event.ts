import { eventWithCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import { RunEventSchema, type RunEvent } from '../../shared/schemas/run-event.js';

/**
 * The one reader of a stored run event (the JSON in `run_events.data`). Rows written before
 * the rename carry run time as `t`, `endT`, `cutoffT`, ...; they are read under the current
 * names and the stored bytes stay as they are.
 */
export function parseStoredRunEvent(data: string): RunEvent {
  return RunEventSchema.parse(eventWithCurrentKeys(JSON.parse(data)));
}
