import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import type { Clock } from '../engine/clock.js';
import { loadScenario } from '../scenario/registry.js';
import { startStreamMeter } from './stdio-meter.js';

/** A clock that jumps forward by hand; due timers run as it passes them. */
function jumpClock(): Clock & { jump(ms: number): void } {
  let now = 0;
  const timers = new Map<number, { at: number; fn: () => void }>();
  let id = 0;
  return {
    nowMs: () => now,
    setTimeout: (fn, ms) => (timers.set(++id, { at: now + ms, fn }), id),
    clearTimeout: (h) => void timers.delete(h as number),
    jump(ms) {
      const end = now + ms;
      for (;;) {
        const next = [...timers.entries()].sort((a, b) => a[1].at - b[1].at)[0];
        if (!next || next[1].at > end) break;
        timers.delete(next[0]);
        now = next[1].at;
        next[1].fn();
      }
      now = end;
    },
  };
}

describe('meter on plain streams', () => {
  it('CSV to a stream: header and one line per simulated second at the chosen speed', () => {
    const clock = jumpClock();
    const output = new PassThrough();
    const meter = startStreamMeter({ scenario: loadScenario('lfp-12v-weak-cell'), format: 'csv', output, speed: 10, clock });
    clock.jump(1000);
    meter.stop();
    const lines = String(output.read()).trim().split('\r\n');
    // 10× for one real second: samples t = 0..10 s.
    expect(lines[0]).toBe('t_s,volts_V,amps_A,temp_cell_C');
    expect(lines.slice(1).map((l) => Number(l.split(',')[0]))).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
  });

  it('SCPI over streams: queries on the input are answered on the output with the latest sample', () => {
    const clock = jumpClock();
    const input = new PassThrough();
    const output = new PassThrough();
    const meter = startStreamMeter({ scenario: loadScenario('lfp-12v-weak-cell'), format: 'scpi', output, input, speed: 60, clock });
    clock.jump(500);
    input.write('FETC?\n');
    meter.stop();
    const fields = String(output.read()).trim().split(',').map(Number);
    expect(fields[0]).toBe(30);
    expect(fields[6]).toBe(30);
  });
});
