import { useEffect, useState } from 'react';

const DEFAULT_TICK_MS = 1_000;

/** The current time in ms, refreshed every `tickMs`, for "3 s ago" labels. */
export function useNow(tickMs = DEFAULT_TICK_MS): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), tickMs);
    return () => clearInterval(timer);
  }, [tickMs]);
  return now;
}
