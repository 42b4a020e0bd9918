import { describe, expect, it } from 'vitest';
import { checkTimeSteps, createTimeReader, inferTimeFormat, isAbsoluteTime } from './import-time.js';

const utc = { timeZone: 'UTC', decimalComma: false };
const berlin = { timeZone: 'Europe/Berlin', decimalComma: false };

describe('time formats', () => {
  it('reads numbers as seconds, ms, minutes and hours', () => {
    expect(createTimeReader('s', utc)('90.5')).toBe(90.5);
    expect(createTimeReader('ms', utc)('1500')).toBe(1.5);
    expect(createTimeReader('min', utc)('2.5')).toBe(150);
    expect(createTimeReader('h', utc)('0.5')).toBe(1800);
    expect(createTimeReader('s', { timeZone: 'UTC', decimalComma: true })('12,25')).toBe(12.25);
  });

  it('reads h:mm:ss elapsed times, with decimal point or comma, and runs on past midnight', () => {
    const r = createTimeReader('hms', utc);
    expect(r('0:00:01')).toBe(1);
    expect(r('1:02:03.5')).toBe(3723.5);
    expect(r('26:00:00,25')).toBe(93600.25); // elapsed hours may pass 24
    const clock = createTimeReader('hms', utc);
    expect(clock('23:59:59')).toBe(86399);
    expect(clock('00:00:01')).toBe(86401); // the next day, two seconds later
    expect(r('1:2:3')).toBeNaN();
  });

  it('reads dd.mm.yyyy day-first, never as month-first: 03.04.2026 is 3 April (30 days after 4 March)', () => {
    const dmy = createTimeReader('dmy', utc)('03.04.2026 10:00:00');
    const mdy = createTimeReader('mdy', utc)('03/04/2026 10:00:00');
    expect(dmy).toBe(Date.UTC(2026, 3, 3, 10) / 1000);
    expect(mdy).toBe(Date.UTC(2026, 2, 4, 10) / 1000);
    expect((dmy - mdy) / 86400).toBe(30);
    expect(createTimeReader('dmy', utc)('31.04.2026 10:00')).toBeNaN(); // April has 30 days
    expect(createTimeReader('mdy', utc)('13/01/2026')).toBeNaN();
    expect(createTimeReader('dmy', utc)('15.07.26 12:00:00,5')).toBe(Date.UTC(2026, 6, 15, 12, 0, 0, 500) / 1000);
  });

  it("reads dates in the lab's zone, not the server's: 15.07.2026 12:00 in Berlin is 10:00 UTC", () => {
    // Berlin keeps UTC+2 in July (EU summer time, from memory).
    expect(createTimeReader('dmy', berlin)('15.07.2026 12:00:00')).toBe(Date.UTC(2026, 6, 15, 10) / 1000);
    expect(createTimeReader('iso', berlin)('2026-07-15 12:00:00')).toBe(Date.UTC(2026, 6, 15, 10) / 1000);
    expect(createTimeReader('iso', berlin)('2026-07-15T12:00:00Z')).toBe(Date.UTC(2026, 6, 15, 12) / 1000);
  });

  it('reads spreadsheet serial days: 46218.5 is noon on 15 Jul 2026 (days since 30 Dec 1899, common practice)', () => {
    // 46218 days after 1899-12-30: Date.UTC arithmetic gives 2026-07-15.
    expect(Date.UTC(1899, 11, 30) + 46218 * 86_400_000).toBe(Date.UTC(2026, 6, 15));
    expect(createTimeReader('serial-days', utc)('46218.5')).toBe(Date.UTC(2026, 6, 15, 12) / 1000);
    expect(createTimeReader('serial-days', berlin)('46218.5')).toBe(Date.UTC(2026, 6, 15, 10) / 1000);
    const r = createTimeReader('serial-days', utc);
    expect(r('46218.500011574') - r('46218.5')).toBeCloseTo(1, 3); // one second is 1/86400 day
  });
});

describe('recognising a time column the header does not label', () => {
  it('tells clock times, ISO dates and Unix times in ms apart by themselves', () => {
    expect(inferTimeFormat('0:00:01', 'Time')).toBe('hms');
    expect(inferTimeFormat('2026-07-15 12:00:00', 'Time')).toBe('iso');
    expect(inferTimeFormat('1784109600000', 'timestamp')).toBe('ms'); // 15 Jul 2026 10:00 UTC as Unix ms
    expect(inferTimeFormat('1784109600', 'timestamp')).toBe('s');
    expect(inferTimeFormat('12.5', 'Time')).toBe('s');
  });

  it('asks for day-first or month-first rather than guess a date like 03.04.2026', () => {
    expect(() => inferTimeFormat('03.04.2026 10:00:00', 'Datum')).toThrow(/day-first or month-first; choose the time format/);
  });

  it('says a Unix time is an instant, an elapsed count is not', () => {
    expect(isAbsoluteTime('s', 1784109600)).toBe(true);
    expect(isAbsoluteTime('s', 12)).toBe(false);
    expect(isAbsoluteTime('dmy', 0)).toBe(true);
  });
});

describe('plausibility of the steps', () => {
  const base = { format: 's' as const, source: 'inferred' as const, column: 'Time', spanSeconds: 3600 };
  it('takes 1 s, 60 s and 300 s logs whose unit is stated', () => {
    expect(() => checkTimeSteps({ ...base, source: 'header', medianStepSeconds: 1 })).not.toThrow();
    expect(() => checkTimeSteps({ ...base, source: 'header', medianStepSeconds: 60 })).not.toThrow();
    expect(() => checkTimeSteps({ ...base, source: 'header', medianStepSeconds: 300, spanSeconds: 86_400 })).not.toThrow();
  });
  it('asks for the unit of a bare Time in ms (steps of 1000 read as seconds would be 17 min apart)', () => {
    expect(() => checkTimeSteps({ ...base, medianStepSeconds: 1000, spanSeconds: 3_600_000 })).toThrow(/has no unit and steps of 1000 \(median\): seconds .* or milliseconds \(1 s apart\)\? Choose the time format/);
  });
  it('refuses steps finer than a millisecond, coarser than an hour, or a span over a year', () => {
    expect(() => checkTimeSteps({ ...base, format: 'ms', source: 'header', medianStepSeconds: 1e-6 })).toThrow(/finer than any battery logger/);
    expect(() => checkTimeSteps({ ...base, format: 'min', source: 'chosen', medianStepSeconds: 60_000 })).toThrow(/more than an hour between readings/);
    expect(() => checkTimeSteps({ ...base, source: 'header', medianStepSeconds: 1, spanSeconds: 1e300 })).toThrow(/more than a year/);
  });
});
