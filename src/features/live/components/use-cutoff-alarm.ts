import { useCallback, useEffect, useState } from 'react';
import { LIVE_RUN_STATES } from '../../../../shared/schemas/run';
import type { RunEvent } from '../../../../shared/schemas/run-event';
import type { LiveStore, LiveView } from '../../../lib/live-store';
import { safeSession } from '../../../lib/safe-storage';

const ACK_KEY_PREFIX = 'kneepoint.alarm-ack.';

/** The event that makes the room loud: a cutoff, or any critical alarm. */
export function isAlarmEvent(e: RunEvent): boolean {
  return e.type === 'cutoff' || (e.type === 'alarm' && e.level === 'critical');
}

function lastAlarmEvent(events: readonly RunEvent[]): RunEvent | null {
  for (let i = events.length - 1; i >= 0; i--) if (isAlarmEvent(events[i])) return events[i];
  return null;
}

export interface ActiveAlarm {
  key: string;
  event: RunEvent;
}

/**
 * Decides whether a run's alarm is sounding: a cutoff (or critical alarm) that nobody has
 * acknowledged in this browser, on a run that is still live or whose cutoff arrived while
 * this page was open. Acknowledging silences it here only; the event stays on the timeline.
 */
export function useCutoffAlarm(store: LiveStore, view: LiveView): { alarm: ActiveAlarm | null; acknowledge: () => void } {
  const [arrivedLive, setArrivedLive] = useState<ReadonlySet<string>>(new Set());
  const [acked, setAcked] = useState<ReadonlySet<string>>(new Set());
  const runId = view.run?.id ?? null;

  useEffect(
    () =>
      store.onEvent((e, live) => {
        if (live && isAlarmEvent(e)) setArrivedLive((s) => new Set(s).add(`${runId}:${e.t}`));
      }),
    [store, runId],
  );

  const event = lastAlarmEvent(view.events);
  const key = event && runId !== null ? `${runId}:${event.t}` : null;
  const runLive = view.run ? LIVE_RUN_STATES.includes(view.run.state) : false;
  const isAcked = key !== null && (acked.has(key) || safeSession.get(ACK_KEY_PREFIX + key) === '1');
  const active = key !== null && event !== null && !isAcked && (runLive || arrivedLive.has(key));

  const acknowledge = useCallback(() => {
    if (!key) return;
    safeSession.set(ACK_KEY_PREFIX + key, '1');
    setAcked((s) => new Set(s).add(key));
  }, [key]);

  return { alarm: active ? { key: key!, event: event! } : null, acknowledge };
}
