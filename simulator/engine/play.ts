import type { Clock } from './clock.js';
import type { SimReading } from './simulation.js';
import { MS_PER_S } from '../../shared/units/time.js';

/** Never wake more often than this: at high speeds several readings go out per wake-up. */
const MIN_WAKE_MS = 5;

/** A running real-time player. */
export interface Player {
  /** Resolves when the program has ended or the player was stopped. */
  readonly finished: Promise<void>;
  stop(): void;
}

/**
 * Releases readings at their due real time: reading k at start + k·period/speed.
 * Late wake-ups catch up at once, so a busy event loop never stretches simulated time.
 */
export function playReadings(
  source: { step(): SimReading | undefined },
  readingPeriodSeconds: number,
  speed: number,
  clock: Clock,
  onReading: (reading: SimReading) => void,
): Player {
  if (!(speed > 0)) throw new Error(`speed must be a positive number, got ${speed}`);
  const startMs = clock.nowMs();
  // Multiply before dividing so that reading 60 at 60× is due at exactly 1000 ms.
  const dueAtMs = (k: number): number => startMs + (k * readingPeriodSeconds * MS_PER_S) / speed;
  let index = 0;
  let handle: unknown;
  let stopped = false;
  let resolve: () => void = () => undefined;
  const finished = new Promise<void>((r) => (resolve = r));

  const wake = (): void => {
    handle = undefined;
    while (!stopped && dueAtMs(index) <= clock.nowMs()) {
      const next = source.step();
      if (!next) {
        stopped = true;
        resolve();
        return;
      }
      index += 1;
      onReading(next);
    }
    if (stopped) return;
    const dueMs = dueAtMs(index) - clock.nowMs();
    handle = clock.setTimeout(wake, Math.max(MIN_WAKE_MS, dueMs));
  };
  wake();
  return {
    finished,
    stop() {
      stopped = true;
      if (handle !== undefined) clock.clearTimeout(handle);
      resolve();
    },
  };
}
