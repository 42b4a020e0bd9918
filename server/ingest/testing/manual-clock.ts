import type { Clock, TimerHandle } from '../clock.js';

interface PendingTimer {
  id: number;
  dueMs: number;
  fn: () => void;
}

/** A clock for tests: time moves only when `advance` is called, and due timers run in order. */
export class ManualClock implements Clock {
  private current: number;
  private timers: PendingTimer[] = [];
  private nextId = 1;

  constructor(startMs = Date.UTC(2026, 0, 1)) {
    this.current = startMs;
  }

  nowMs(): number {
    return this.current;
  }

  setTimeout(fn: () => void, delayMs: number): TimerHandle {
    const timer = { id: this.nextId++, dueMs: this.current + Math.max(0, delayMs), fn };
    this.timers.push(timer);
    return { id: timer.id };
  }

  clearTimeout(handle: TimerHandle): void {
    const id = (handle as { id: number }).id;
    this.timers = this.timers.filter((t) => t.id !== id);
  }

  /** Number of timers still waiting. */
  pendingCount(): number {
    return this.timers.length;
  }

  /** Moves time forward by `ms`, running every timer that falls due on the way, in due order. */
  advance(ms: number): void {
    const endMs = this.current + ms;
    for (;;) {
      const due = this.timers
        .filter((t) => t.dueMs <= endMs)
        .sort((a, b) => a.dueMs - b.dueMs || a.id - b.id)[0];
      if (!due) break;
      this.timers = this.timers.filter((t) => t !== due);
      this.current = due.dueMs;
      due.fn();
    }
    this.current = endMs;
  }
}
