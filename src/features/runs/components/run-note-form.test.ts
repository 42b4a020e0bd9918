import { describe, expect, it } from 'vitest';
import { noteTimeProblem, parseRunClock } from './run-note-form';

describe('parseRunClock', () => {
  it('reads h:mm:ss as seconds since the run started', () => {
    expect(parseRunClock('1:05:00')).toBe(3900);
    expect(parseRunClock('26:00:01')).toBe(93_601);
  });

  it('takes an empty field as "no time" and refuses anything else', () => {
    expect(parseRunClock('  ')).toBeUndefined();
    expect(parseRunClock('1:65:00')).toBeNaN();
    expect(parseRunClock('90 s')).toBeNaN();
  });

  it('refuses a note time after the run ended, and accepts one within it', () => {
    // A run of 1 h 59 min 13 s (7,153 s).
    expect(noteTimeProblem(parseRunClock('3:00:00'), 7153)).toMatch(/The run lasted 01:59:13/);
    expect(noteTimeProblem(parseRunClock('1:30:00'), 7153)).toBeNull();
    expect(noteTimeProblem(undefined, 7153)).toBeNull();
    expect(noteTimeProblem(parseRunClock('1:65:00'), 7153)).toMatch(/h:mm:ss/);
  });
});
