import { describe, expect, it } from 'vitest';
import type { Frame } from '../../shared/schemas/frame.js';
import { SourceClockGuard } from './source-clock-guard.js';

const JUMP_S = 30;
const f = (t: number): Frame => ({ t, volts: 13, amps: 2, clock: 'device' });
/** Feeds source times (arriving one second apart on the server) and returns the run-line times recorded. */
function feed(guard: SourceClockGuard, times: number[], arrival = (i: number) => 1000 + i): { out: number[]; glitches: number[] } {
  const out: number[] = [];
  const glitches: number[] = [];
  times.forEach((t, i) => {
    const r = guard.accept(f(t), arrival(i));
    out.push(...r.frames.map((x) => x.t));
    if (r.glitch) glitches.push(r.glitch.t);
  });
  return { out, glitches };
}

describe('SourceClockGuard', () => {
  it('passes an ordinary time line through unchanged', () => {
    expect(feed(new SourceClockGuard(JUMP_S), [0, 1, 2, 3]).out).toEqual([0, 1, 2, 3]);
  });

  it('drops a single frame stamped far ahead (a corrupted digit) and keeps the frames after it', () => {
    const r = feed(new SourceClockGuard(JUMP_S), [10, 11, 12, 1e300, 13, 14]);
    expect(r.out).toEqual([10, 11, 12, 13, 14]);
    expect(r.glitches).toEqual([1e300]);
  });

  it('drops a single frame stamped far back, too', () => {
    expect(feed(new SourceClockGuard(JUMP_S), [500, 501, 5, 502]).out).toEqual([500, 501, 502]);
  });

  it('lets a real pause through (confirmed by the next frame), for the core to mark as a gap', () => {
    expect(feed(new SourceClockGuard(JUMP_S), [0, 1, 61, 62]).out).toEqual([0, 1, 61, 62]);
  });

  it('continues a restarted meter clock after the last reading, by the time the server saw pass', () => {
    // Readings at 100..102 s arrive at 1000..1002; the meter restarts and its t = 0, 1 arrive at 1062, 1063.
    const arrivals = [1000, 1001, 1002, 1062, 1063, 1064];
    const r = feed(new SourceClockGuard(JUMP_S), [100, 101, 102, 0, 1, 2], (i) => arrivals[i]!);
    expect(r.out).toEqual([100, 101, 102, 162, 163, 164]);
  });

  it('keeps every frame of a meter polled more slowly than the jump limit', () => {
    // Every other frame waits for the next one to confirm it; none is lost.
    expect(feed(new SourceClockGuard(JUMP_S), [0, 60, 120, 180, 240]).out).toEqual([0, 60, 120, 180, 240]);
  });

  it('hands a small step back or a repeat on unchanged (the core refuses and counts it)', () => {
    expect(feed(new SourceClockGuard(JUMP_S), [0, 1, 2, 1.5, 2, 3]).out).toEqual([0, 1, 2, 1.5, 2, 3]);
  });
});
