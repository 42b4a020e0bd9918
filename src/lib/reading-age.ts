import type { BenchStatus } from '../../shared/schemas/bench';
import type { LiveView } from './live-view';
import { useServerClockOffsetMs } from './use-live';
import { useNow } from './use-now';
import { MS_PER_S } from '../../shared/units/time';

/** Readings older than this are shown as stale even before the server says the meter went quiet. */
export const STALE_AFTER_S = 10;
/** Source states in which the numbers on screen are the last ones seen, not the present. */
const QUIET_STATES = new Set(['stale', 'error', 'reconnecting', 'idle']);

/**
 * How old the newest reading on screen is, in seconds (null before the first), from the
 * server's last-frame time and from when this browser last got a batch (the newer wins).
 */
export function readingAgeSeconds(view: Pick<LiveView, 'receivedAtMs'>, status: Pick<BenchStatus, 'lastFrameAt'> | null | undefined, nowMs: number, offsetMs: number): number | null {
  const fromServer = status?.lastFrameAt ? (nowMs + offsetMs - Date.parse(status.lastFrameAt)) / MS_PER_S : Infinity;
  const fromBrowser = view.receivedAtMs === null ? Infinity : (nowMs - view.receivedAtMs) / MS_PER_S;
  const age = Math.min(fromServer, fromBrowser);
  return Number.isFinite(age) ? Math.max(0, age) : null;
}

/** Whether numbers of this age, from a source in this state, are stale (old or from a quiet meter). */
export function isStale(ageSeconds: number | null, state: BenchStatus['state'] | undefined): boolean {
  if (ageSeconds === null) return false;
  return ageSeconds > STALE_AFTER_S || (state !== undefined && QUIET_STATES.has(state));
}

/** The age of the newest reading, ticking every second, and whether it is stale. */
export function useReadingAge(view: Pick<LiveView, 'receivedAtMs'>, status: BenchStatus | null | undefined): { ageSeconds: number | null; stale: boolean } {
  const now = useNow();
  const offsetMs = useServerClockOffsetMs();
  const ageSeconds = readingAgeSeconds(view, status, now, offsetMs);
  return { ageSeconds, stale: isStale(ageSeconds, status?.state) };
}
