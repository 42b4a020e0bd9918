import { useCallback, useEffect, useState } from 'react';
import { LIVE_RUN_STATES } from '../../../shared/schemas/run';
import type { RunEvent } from '../../../shared/schemas/run-event';
import type { LiveStore, LiveView } from '../../lib/live-store';
import { safeSession } from '../../lib/safe-storage';

const ACK_KEY_PREFIX = 'kneepoint.alarm-ack.';

/** The events that make the room loud: a cutoff, or any critical alarm. */
export function isAlarmEvent(e: RunEvent): boolean {
  return e.type === 'cutoff' || (e.type === 'alarm' && e.level === 'critical');
}

const keyOf = (runId: number, e: RunEvent) => `${runId}:${e.type}:${e.t}`;

export interface ActiveAlarm {
  /** Keys of every unacknowledged alarm event; one acknowledgement silences them all. */
  keys: string[];
  /** The one to show: a cutoff outranks the generic alarm the server raises with it. */
  event: RunEvent;
}

/**
 * Decides whether a run's alarm is sounding: alarm events nobody has acknowledged in this
 * browser, on a run that is still live or whose alarm arrived while this page was open.
 * Acknowledging silences it here only; the events stay on the timeline.
 */
export function useCutoffAlarm(store: LiveStore, view: LiveView): { alarm: ActiveAlarm | null; acknowledge: () => void } {
  const [arrivedLive, setArrivedLive] = useState<ReadonlySet<string>>(new Set());
  const [acked, setAcked] = useState<ReadonlySet<string>>(new Set());
  const runId = view.run?.id ?? null;

  useEffect(
    () =>
      store.onEvent((e, live) => {
        if (live && isAlarmEvent(e) && runId !== null) setArrivedLive((s) => new Set(s).add(keyOf(runId, e)));
      }),
    [store, runId],
  );

  const runLive = view.run ? LIVE_RUN_STATES.includes(view.run.state) : false;
  const pending =
    runId === null
      ? []
      : view.events.filter((e) => {
          if (!isAlarmEvent(e)) return false;
          const key = keyOf(runId, e);
          const isAcked = acked.has(key) || safeSession.get(ACK_KEY_PREFIX + key) === '1';
          return !isAcked && (runLive || arrivedLive.has(key));
        });
  const shown = [...pending].reverse().find((e) => e.type === 'cutoff') ?? pending[pending.length - 1];
  const keys = runId === null ? [] : pending.map((e) => keyOf(runId, e));
  const keysText = keys.join('|');

  const acknowledge = useCallback(() => {
    if (!keysText) return;
    const list = keysText.split('|');
    list.forEach((k) => safeSession.set(ACK_KEY_PREFIX + k, '1'));
    setAcked((s) => new Set([...s, ...list]));
  }, [keysText]);

  return { alarm: shown ? { keys, event: shown } : null, acknowledge };
}
