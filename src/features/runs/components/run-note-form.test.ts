import { describe, expect, it } from 'vitest';
import { parseRunClock } from './run-note-form';

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
});
