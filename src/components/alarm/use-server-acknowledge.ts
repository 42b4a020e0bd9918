import { useCallback, useState } from 'react';
import { acknowledgeAlarm, fetchRunAlarms } from '../../lib/queries/alarms';

/**
 * Acknowledges a run's open alarms on the server (who and when go on the run's timeline and
 * escalation stops for everyone), unlike silencing, which only quiets this browser.
 */
export function useServerAcknowledge(runId: number | null, onDone: () => void): { acknowledge: () => void; busy: boolean; error: string | null } {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const acknowledge = useCallback(() => {
    if (runId === null || busy) return;
    setBusy(true);
    setError(null);
    void fetchRunAlarms(runId)
      .then(async (alarms) => {
        for (const a of alarms) if (a.state === 'unacknowledged' || a.state === 'cleared-unacknowledged') await acknowledgeAlarm(a.id);
        onDone();
      })
      .catch((err: unknown) => setError(err instanceof Error ? err.message : 'Could not acknowledge'))
      .finally(() => setBusy(false));
  }, [runId, busy, onDone]);
  return { acknowledge, busy, error };
}
