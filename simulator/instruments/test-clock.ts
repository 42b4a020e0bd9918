import type { Clock } from '../engine/clock.js';

/** A wall clock for tests: time moves only on advance(), and due timers run in order. */
export class TestClock implements Clock {
  private currentMs = 0;
  private timers: { id: number; dueMs: number; run: () => void }[] = [];
  private nextId = 1;

  nowMs(): number {
    return this.currentMs;
  }

  setTimeout(run: () => void, delayMs: number): unknown {
    const id = this.nextId++;
    this.timers.push({ id, dueMs: this.currentMs + delayMs, run });
    return id;
  }

  clearTimeout(handle: unknown): void {
    this.timers = this.timers.filter((t) => t.id !== handle);
  }

  /** Moves time forward, running each timer that falls due. */
  advance(ms: number): void {
    const endMs = this.currentMs + ms;
    for (;;) {
      const due = this.timers.filter((t) => t.dueMs <= endMs).sort((a, b) => a.dueMs - b.dueMs)[0];
      if (!due) break;
      this.timers = this.timers.filter((t) => t !== due);
      this.currentMs = due.dueMs;
      due.run();
    }
    this.currentMs = endMs;
  }
}
