import { describe, expect, it } from 'vitest';
import { parseTimestampMs } from './zoned-time.js';

describe('parseTimestampMs', () => {
  it('takes a timestamp with a zone as it says, whatever the lab zone', () => {
    expect(parseTimestampMs('2026-01-01T10:00:00+02:00', 'America/New_York')).toBe(Date.UTC(2026, 0, 1, 8));
    expect(parseTimestampMs('2026-01-01T10:00:00Z', 'Europe/Berlin')).toBe(Date.UTC(2026, 0, 1, 10));
  });

  it('reads a zone-less timestamp as wall time in the lab zone, summer and winter', () => {
    // Central European Time is UTC+1 in winter and UTC+2 in summer (EU summer-time rules, from memory).
    expect(parseTimestampMs('2026-01-15 12:00:00', 'Europe/Berlin')).toBe(Date.UTC(2026, 0, 15, 11));
    expect(parseTimestampMs('2026-07-15T12:00:00.5', 'Europe/Berlin')).toBe(Date.UTC(2026, 6, 15, 10, 0, 0, 500));
    expect(parseTimestampMs('2026-07-15 12:00', 'UTC')).toBe(Date.UTC(2026, 6, 15, 12));
  });

  it('keeps seconds counting across the spring change (02:00 → 03:00 on 29 March 2026 in Berlin)', () => {
    // The EU changes clocks on the last Sunday of March at 01:00 UTC (common practice, from memory).
    const before = parseTimestampMs('2026-03-29 01:59:59', 'Europe/Berlin');
    const after = parseTimestampMs('2026-03-29 03:00:00', 'Europe/Berlin');
    expect(after - before).toBe(1000);
  });

  it("reads a date alone as the lab's midnight, and refuses a date that does not exist", () => {
    // Berlin keeps UTC+2 in July (EU summer time, from memory): local midnight is 22:00 UTC the day before.
    expect(parseTimestampMs('2026-07-15', 'Europe/Berlin')).toBe(Date.UTC(2026, 6, 14, 22));
    expect(parseTimestampMs('2026-02-30 10:00:00', 'UTC')).toBeNaN();
  });

  it('answers NaN for text that is no timestamp', () => {
    expect(parseTimestampMs('yesterday-ish', 'UTC')).toBeNaN();
  });
});
