/**
 * The clock every source uses for time stamps, back-off and watchdogs. Injected so that
 * tests advance time by hand instead of sleeping.
 */
export interface Clock {
  /** Milliseconds since the Unix epoch. */
  nowMs(): number;
  setTimeout(fn: () => void, delayMs: number): TimerHandle;
  clearTimeout(handle: TimerHandle): void;
}

/** Opaque timer handle; only the clock that made it understands it. */
export type TimerHandle = { readonly __timer: unique symbol } | object;

/** The real clock: Date.now and the global timers. */
export const systemClock: Clock = {
  nowMs: () => Date.now(),
  setTimeout: (fn, delayMs) => {
    const handle = setTimeout(fn, delayMs);
    // A pending retry or watchdog must never keep the process alive on shutdown.
    handle.unref();
    return handle;
  },
  clearTimeout: (handle) => clearTimeout(handle as NodeJS.Timeout),
};
