import { useCallback, useEffect, useState } from 'react';
import { LIVE_RUN_STATES } from '../../../shared/schemas/run';
import type { RunEvent } from '../../../shared/schemas/run-event';
import type { LiveStore, LiveView } from '../../lib/live-store';
import { safeSession } from '../../lib/safe-storage';

const ACK_KEY_PREFIX = 'kneepoint.alarm-ack.';

/**
 * The events that make the room loud: a cutoff, any critical alarm, or a test programme that
 * failed safe (its load and supply switched off, or not confirmed off: someone must look).
 */
export function isAlarmEvent(e: RunEvent): boolean {
  return e.type === 'cutoff' || (e.type === 'alarm' && e.level === 'critical') || (e.type === 'programme-step' && e.phase === 'fail');
}

const keyOf = (runId: number, e: RunEvent) => `${runId}:${e.type}:${e.elapsedSeconds}`;

/** Alarm kinds whose acknowledgement (by anyone, anywhere) quiets the banner. */
const BANNER_KINDS = new Set(['cutoff', 'protection-trip', 'over-temperature', 'programme-failed']);

/** Run time of the latest server acknowledgement of a banner alarm, or -Infinity. */
export function lastAcknowledgedT(events: readonly RunEvent[]): number {
  let latest = -Infinity;
  for (const e of events) if (e.type === 'alarm-ack' && BANNER_KINDS.has(e.code)) latest = Math.max(latest, e.elapsedSeconds);
  return latest;
}

export interface ActiveAlarm {
  /** Keys of every unacknowledged alarm event; one acknowledgement silences them all. */
  keys: string[];
  /** The one to show: a cutoff outranks the generic alarm the server raises with it. */
  event: RunEvent;
}

/**
 * Decides whether a run's alarm is sounding: alarm events nobody has acknowledged in this
 * browser, on a run that is still live or whose alarm arrived while this page was open.
 * Silencing quiets it here only; an acknowledgement recorded on the server (an `alarm-ack`
 * event, from any screen, e-mail link or push action) quiets it on every screen.
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
  // Someone acknowledged on the server (here or on another screen): what came before is taken care of.
  const ackedUpToT = lastAcknowledgedT(view.events);
  const pending =
    runId === null
      ? []
      : view.events.filter((e) => {
          if (!isAlarmEvent(e) || e.elapsedSeconds <= ackedUpToT) return false;
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
