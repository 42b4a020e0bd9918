// vocab-rename: keep (this test feeds the old spellings on purpose)
import { describe, expect, it } from 'vitest';
import { AnnotateRequestSchema, ReadingsQuerySchema } from './api-runs.js';
import { eventWithCurrentKeys, snapshotWithCurrentKeys, summaryWithCurrentKeys } from './legacy-keys.js';
import { RunEventSchema } from './run-event.js';
import { ReadingColumnsSchema } from './ws.js';

describe('run time stored as `t` before the rename', () => {
  it('reads an old gap, recovery and protection-check release under the current names', () => {
    const gap = RunEventSchema.parse(eventWithCurrentKeys({ type: 'gap', t: 1000, endT: 1600, gapSeconds: 600 }));
    expect(gap).toEqual({ type: 'gap', elapsedSeconds: 1000, endElapsedSeconds: 1600, gapSeconds: 600 });
    const recovery = RunEventSchema.parse(eventWithCurrentKeys({ type: 'recovery', t: 620, cutoffT: 500, recoverySeconds: 120, volts: 12.9 }));
    expect(recovery).toEqual({ type: 'recovery', elapsedSeconds: 620, cutoffElapsedSeconds: 500, recoverySeconds: 120, volts: 12.9 });
    const release = RunEventSchema.parse(
      eventWithCurrentKeys({ type: 'protection-check-release', t: 350, protection: 'cold-charge', check: 0, tripT: 0, value: 3, resumeSeconds: 350 }),
    );
    expect(release).toMatchObject({ elapsedSeconds: 350, tripElapsedSeconds: 0 });
  });

  it('keeps the current name when a row has both spellings', () => {
    expect(eventWithCurrentKeys({ type: 'load-on', t: 1, elapsedSeconds: 2 })).toEqual({ type: 'load-on', elapsedSeconds: 2 });
  });

  it("maps a summary's protection trips and a snapshot's notes, nothing else", () => {
    const trip = { volts: 10.6, amps: 0, dischargeAh: 50, dischargeWh: 640, signal: 'current-zero', recoverySeconds: null };
    const summary = { durationSeconds: 7200, protectionTrips: [{ t: 3600, ...trip }] };
    expect(summaryWithCurrentKeys(summary)).toEqual({ durationSeconds: 7200, protectionTrips: [{ elapsedSeconds: 3600, ...trip }] });
    const snapshot = { runId: 4, notes: [{ eventId: 9, t: 60, text: 'fan on', author: null }], summary: null };
    expect(snapshotWithCurrentKeys(snapshot)).toEqual({ runId: 4, notes: [{ eventId: 9, elapsedSeconds: 60, text: 'fan on', author: null }], summary: null });
  });
});

describe('API requests from clients written before the rename', () => {
  it('takes an annotation at `elapsedSeconds`, and the deprecated `t` as the same', () => {
    expect(AnnotateRequestSchema.parse({ text: 'fan on', elapsedSeconds: 60 })).toEqual({ text: 'fan on', elapsedSeconds: 60 });
    expect(AnnotateRequestSchema.parse({ text: 'fan on', t: 60 })).toEqual({ text: 'fan on', elapsedSeconds: 60 });
    expect(AnnotateRequestSchema.parse({ text: 'fan on', t: 1, elapsedSeconds: 60 })).toEqual({ text: 'fan on', elapsedSeconds: 60 });
    expect(AnnotateRequestSchema.safeParse({ text: 'fan on', t: -1 }).success).toBe(false);
  });

  it('takes the readings axis `x=t` as run time', () => {
    expect(ReadingsQuerySchema.parse({ x: 't' }).x).toBe('elapsedSeconds');
    expect(ReadingsQuerySchema.parse({}).x).toBe('elapsedSeconds');
    expect(ReadingsQuerySchema.parse({ x: 'ah' }).x).toBe('ah');
    expect(ReadingsQuerySchema.safeParse({ x: 'kwh' }).success).toBe(false);
  });
});

describe('ReadingColumns', () => {
  const channels = { volts: [12.8], amps: [5], watts: [64], temps: {} };
  it('has exactly one time column: elapsedSeconds (run topic) or t (bench topic)', () => {
    expect(ReadingColumnsSchema.safeParse({ elapsedSeconds: [1], ...channels }).success).toBe(true);
    expect(ReadingColumnsSchema.safeParse({ t: [1_700_000_000], ...channels }).success).toBe(true);
    expect(ReadingColumnsSchema.safeParse({ elapsedSeconds: [1], t: [1_700_000_000], ...channels }).success).toBe(false);
    expect(ReadingColumnsSchema.safeParse(channels).success).toBe(false);
  });
});
