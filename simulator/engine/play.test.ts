import { describe, expect, it } from 'vitest';
import type { Clock } from './clock.js';
import { playReadings } from './play.js';
import type { SimReading } from './simulation.js';

/** A clock that only moves when the test says so; timers fire as time passes them. */
function manualClock(): Clock & { advance(ms: number): void } {
  let nowMs = 0;
  let timers: { at: number; fn: () => void; id: number }[] = [];
  let nextId = 0;
  return {
    nowMs: () => nowMs,
    setTimeout(fn, delayMs) {
      nextId += 1;
      timers.push({ at: nowMs + delayMs, fn, id: nextId });
      return nextId;
    },
    clearTimeout(handle) {
      timers = timers.filter((t) => t.id !== handle);
    },
    advance(ms) {
      const target = nowMs + ms;
      for (;;) {
        const due = timers.filter((t) => t.at <= target).sort((a, b) => a.at - b.at)[0];
        if (!due) break;
        timers = timers.filter((t) => t !== due);
        nowMs = due.at;
        due.fn();
      }
      nowMs = target;
    },
  };
}

function source(total: number) {
  let seq = 0;
  return {
    step: (): SimReading | undefined =>
      seq < total ? ({ seq: seq, t: seq++, frame: { t: seq - 1, volts: 12, amps: 1, clock: 'device' }, corrupt: false, plugged: true } as SimReading) : undefined,
  };
}

describe('real-time player', () => {
  it('at 60× plays 60 one-second samples per real second, stamped in simulated time', () => {
    const clock = manualClock();
    const got: SimReading[] = [];
    const player = playReadings(source(1000), 1, 60, clock, (s) => got.push(s));
    clock.advance(1000);
    // Reading k is due at k/60 s: readings 0..60 are due by t = 1 s.
    expect(got.length).toBe(61);
    expect(got.at(-1)!.frame.t).toBe(60);
    clock.advance(500);
    expect(got.length).toBe(91);
    player.stop();
    clock.advance(10_000);
    expect(got.length).toBe(91);
  });

  it('resolves when the source ends, and refuses a speed that is not positive', async () => {
    const clock = manualClock();
    const got: SimReading[] = [];
    const player = playReadings(source(5), 1, 1, clock, (s) => got.push(s));
    clock.advance(5000);
    await player.finished;
    expect(got.map((s) => s.seq)).toEqual([0, 1, 2, 3, 4]);
    expect(() => playReadings(source(1), 1, 0, clock, () => undefined)).toThrow(/speed/);
  });
});
