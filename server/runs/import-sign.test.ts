import { describe, expect, it } from 'vitest';
import { createSignTally, decideCurrentSign, tallyReading } from './import-sign.js';

/** Tallies a list of [t s, volts, amps] readings. */
function tallyOf(rows: readonly (readonly [number, number, number])[]) {
  const tally = createSignTally();
  rows.forEach(([t, v, a], i) => tallyReading(tally, i ? t - rows[i - 1]![0] : 0, v, a));
  return tally;
}

/**
 * A 12 V lithium iron phosphate round trip logged every 10 s with discharge NEGATIVE: 2 h out
 * at 10 A (13.2 → 12.0 V), then 3.5 h in, CC at 10 A to 14.4 V and CV at 14.4 V while the
 * current tapers (3.6 V a cell charge voltage, common practice for the chemistry).
 */
function roundTrip(): [number, number, number][] {
  const rows: [number, number, number][] = [];
  const step = 10;
  for (let t = 0; t <= 7200; t += step) rows.push([t, 13.2 - (1.2 * t) / 7200, -10]);
  const ccEnd = 7200 + 2 * 3600;
  for (let t = 7200 + step; t <= 7200 + 3.5 * 3600; t += step) {
    const cc = t <= ccEnd;
    const volts = cc ? 13.0 + (1.4 * (t - 7200)) / (ccEnd - 7200) : 14.4;
    const amps = cc ? 10 : 10 * Math.exp(-(t - ccEnd) / 1800);
    rows.push([t, volts, amps]);
  }
  return rows;
}

describe('currentSign auto', () => {
  it('gives the discharge of a round trip as "out" even when the charge lasts longer (2 h out at 10 A, 3.5 h CC-CV in)', () => {
    const rows = roundTrip();
    const tally = tallyOf(rows);
    // The charge has more rows and more Ah, so a count of rows (or of Ah) picks the wrong sign.
    expect(rows.filter((r) => r[2] > 0).length).toBeGreaterThan(rows.filter((r) => r[2] < 0).length);
    expect(tally.positive.ah).toBeGreaterThan(tally.negative.ah);
    const d = decideCurrentSign(tally);
    expect(d.flip).toBe(true);
    expect(d.reason).toMatch(/^negative amps are discharge/);
    // 10 A for 2 h is 20 Ah out (constant-current arithmetic; right-point sums on a 10 s grid are exact here).
    expect(tally.negative.ah).toBeCloseTo(20, 9);
  });

  it('reads a one-way log by its voltage: falling is discharge, rising is charge', () => {
    const falling = tallyOf(Array.from({ length: 100 }, (_, i) => [i, 13.2 - i * 0.01, 5] as const));
    expect(decideCurrentSign(falling)).toMatchObject({ flip: false });
    const fallingNegative = tallyOf(Array.from({ length: 100 }, (_, i) => [i, 4.19 - i * 0.01, -2] as const));
    expect(decideCurrentSign(fallingNegative)).toMatchObject({ flip: true });
    const rising = tallyOf(Array.from({ length: 100 }, (_, i) => [i, 12 + i * 0.01, 5] as const));
    expect(decideCurrentSign(rising)).toMatchObject({ flip: true });
  });

  it('ignores noise of the other sign around zero (rest after a discharge)', () => {
    const rows: [number, number, number][] = Array.from({ length: 100 }, (_, i) => [i, 13 - i * 0.02, -5]);
    for (let i = 100; i < 200; i++) rows.push([i, 12.5, i % 2 ? 0.004 : -0.004]);
    expect(decideCurrentSign(tallyOf(rows)).flip).toBe(true);
  });

  it('asks when the file cannot tell: current both ways at one voltage, or one way at a flat voltage', () => {
    const flat = tallyOf(Array.from({ length: 100 }, (_, i) => [i, 12, i < 50 ? 5 : -5] as const));
    expect(() => decideCurrentSign(flat)).toThrow(/cannot be told from this file .* choose which sign is discharge/);
    const oneWayFlat = tallyOf(Array.from({ length: 100 }, (_, i) => [i, 12, 5] as const));
    expect(() => decideCurrentSign(oneWayFlat)).toThrow(/current flows positive only/);
  });
});
