/** A clock the pacing loop reads and waits on; tests inject a fake one. */
export interface Clock {
  /** Milliseconds since the Unix epoch (the same member as the server's Clock, so one clock serves both). */
  nowMs(): number;
  setTimeout(callback: () => void, delayMs: number): unknown;
  clearTimeout(handle: unknown): void;
}

/** The real wall clock. */
export const systemClock: Clock = {
  nowMs: () => Date.now(),
  setTimeout: (callback, delayMs) => setTimeout(callback, delayMs),
  clearTimeout: (handle) => clearTimeout(handle as ReturnType<typeof setTimeout>),
};
