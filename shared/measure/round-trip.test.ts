import { describe, expect, it } from 'vitest';
import { createRunPipeline } from './run-pipeline.js';
import { summarizeRun } from './summarize-run.js';
import type { Frame } from '../schemas/frame.js';

// Synthetic piecewise-constant and linear traces: the trapezoid rule integrates them exactly,
// so the Wh in and out have closed forms. Trade arithmetic (common practice): 8 LFP cells
// rated 50 Ah discharged at 10 A and 25.6 V for 5 h deliver 1,280 Wh.
const HOUR_S = 3600;
/** Step between one segment's last reading and the next one's first, s (a switch). */
const SWITCH_S = 1e-4;

/** Readings every `stepSeconds` over `seconds`, starting SWITCH_S after `after` (or at 0). */
function segment(after: Frame[], seconds: number, at: (s: number) => { volts: number; amps: number }, stepSeconds = 10): Frame[] {
  const t0 = after.length === 0 ? 0 : after.at(-1)!.t + SWITCH_S;
  const out: Frame[] = [];
  for (let s = 0; s <= seconds; s += stepSeconds) out.push({ t: t0 + s, clock: 'device', ...at(s) });
  return out;
}

function summarize(frames: Frame[]) {
  const p = createRunPipeline({ chemistry: 'lfp', cellsInSeries: 8, ratedAh: 50 });
  const { events } = p.pushMany(frames);
  return summarizeRun({ snapshot: p.snapshot(), events });
}

const discharge = segment([], 5 * HOUR_S, () => ({ volts: 25.6, amps: 10 }));

describe('round-trip efficiency: matched discharge and full charge', () => {
  it('a full discharge then a partial recharge is incomplete, never 287.8 %', () => {
    // 1,280 Wh out; 16 Ah in at 27.8 V = 444.8 Wh, and the charge stopped at full current.
    const charge = segment(discharge, 1.6 * HOUR_S, () => ({ volts: 27.8, amps: -10 }));
    const s = summarize([...discharge, ...charge]);
    expect(s.dischargeWh / s.chargeWh).toBeCloseTo(2.878, 3); // what the whole-run ratio gave
    expect(s).toMatchObject({ roundTripStatus: 'incomplete', roundTripEfficiency: null });
  });

  it('a full discharge then a CC-CV charge that tapers: Wh out ÷ Wh in, exactly', () => {
    // CC: 10 A at 27.6 V for 4.5 h = 1,242 Wh; CV: 28.8 V while the current falls linearly 10 → 1 A over 1 h = 158.4 Wh.
    const cc = segment(discharge, 4.5 * HOUR_S, () => ({ volts: 27.6, amps: -10 }));
    const cv = segment(cc, HOUR_S, (s) => ({ volts: 28.8, amps: -(10 - (9 * s) / HOUR_S) }));
    const s = summarize([...discharge, ...cc, ...cv]);
    expect(s.roundTripStatus).toBe('complete');
    expect(Math.abs(s.roundTripEfficiency! - 1280 / 1400.4)).toBeLessThan(1e-6);
  });

  it('a charge that stops at full current but put back more Ah than came out is full', () => {
    // 52 Ah in at 27.6 V (1,435.2 Wh) after 50 Ah out.
    const charge = segment(discharge, 5.2 * HOUR_S, () => ({ volts: 27.6, amps: -10 }));
    const s = summarize([...discharge, ...charge]);
    expect(s.roundTripStatus).toBe('complete');
    expect(s.roundTripEfficiency!).toBeCloseTo(1280 / 1435.2, 6);
    expect(s.roundTripEfficiency!).toBeLessThan(1);
  });

  it('a discharge alone has no round trip', () => {
    expect(summarize(discharge)).toMatchObject({ roundTripStatus: null, roundTripEfficiency: null });
  });
});
