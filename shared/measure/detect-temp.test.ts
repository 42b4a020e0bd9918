import { describe, expect, it } from 'vitest';
import { createRunPipeline } from './run-pipeline.js';
import { noise, trace } from './synthetic-trace.test-helper.js';

// Common practice: a pack's BMS inhibits charging below 0 °C after
// about one minute, and cuts off above its high limit within about 20 s; a self-heating pack
// heats from 0 °C (32 °F) to about 5 °C (41 °F) drawing 3 to 6 A. Traces are synthetic with
// seeded noise; times are checked to within one sample period (1 s here) plus the noise's shift.

describe('temperature protection trip delay', () => {
  it('low-temperature charge inhibit: 60 s from crossing 0 °C to ~0 A', () => {
    const n = noise(5);
    // Cell cools 5 → −5 °C over 600 s (crosses 0 °C at t = 300 s); the BMS stops charge at t = 360 s.
    const frames = trace(0, 600, (t) => ({
      volts: 27 + n(0.01),
      amps: t < 360 ? -5 + n(0.02) : n(0.01),
      temps: { cell: 5 - t / 60 + n(0.005) },
    }));
    const p = createRunPipeline({ tempProtections: [{ kind: 'low-temp-charge', channel: 'cell', limitCelsius: 0, direction: 'below', current: 'charge' }] });
    const trips = p.pushMany(frames).events.filter((e) => e.type === 'protection-trip');
    expect(trips).toHaveLength(1);
    expect(trips[0]).toMatchObject({ kind: 'low-temp-charge', channel: 'cell', elapsedSeconds: 360 });
    expect(Math.abs(trips[0]!.crossedElapsedSeconds - 300)).toBeLessThanOrEqual(1);
    expect(Math.abs(trips[0]!.delaySeconds - 60)).toBeLessThanOrEqual(1);
  });

  it('high-temperature cutoff: ~20 s, then reset once cool and current flows again', () => {
    const n = noise(6);
    const frames = trace(0, 400, (t) => ({
      volts: 25 + n(0.01),
      amps: t >= 120 && t < 300 ? n(0.01) : 10 + n(0.05),
      temps: { cell: t < 200 ? 50 + t / 10 + n(0.005) : 70 - (t - 200) / 5 + n(0.005) }, // crosses 60 °C at t = 100 s
    }));
    const p = createRunPipeline({ tempProtections: [{ kind: 'high-temp-discharge', channel: 'cell', limitCelsius: 60, direction: 'above', current: 'discharge' }] });
    const ev = p.pushMany(frames).events.filter((e) => e.type === 'protection-trip' || e.type === 'protection-reset');
    expect(ev.map((e) => e.type)).toEqual(['protection-trip', 'protection-reset']);
    expect(ev[0]!.elapsedSeconds).toBe(120);
    expect(Math.abs((ev[0] as { crossedElapsedSeconds: number }).crossedElapsedSeconds - 100)).toBeLessThanOrEqual(1);
    expect(Math.abs((ev[0] as { delaySeconds: number }).delaySeconds - 20)).toBeLessThanOrEqual(1);
    expect(ev[1]!.elapsedSeconds).toBe(300);
  });

  it('a temperature hovering at the limit arms once and trips once', () => {
    const n = noise(7);
    const frames = trace(0, 600, (t) => ({ volts: 27, amps: t < 400 ? -5 + n(0.02) : n(0.01), temps: { cell: n(0.3) } }));
    const p = createRunPipeline({ tempProtections: [{ kind: 'low-temp-charge', channel: 'cell', limitCelsius: 0, direction: 'below', current: 'charge' }] });
    expect(p.pushMany(frames).events.filter((e) => e.type === 'protection-trip')).toHaveLength(1);
  });
});

describe('temperature protection already holding at the start', () => {
  it('a pack below 0 °C at the first reading is recorded, and charging resuming after warming is a reset', () => {
    // Issue 11 item 7: cold-charge box ticked, pack at −4 °C from the start: nothing was recorded.
    const frames = trace(0, 600, (t) => ({ volts: 13.2, amps: t < 350 ? 0 : -10, temps: { cell: -4 + t / 50 } }));
    const p = createRunPipeline({ tempProtections: [{ kind: 'low-temp-charge', channel: 'cell', limitCelsius: 0, direction: 'below', current: 'charge' }] });
    const ev = p.pushMany(frames).events.filter((e) => e.type === 'protection-trip' || e.type === 'protection-reset');
    expect(ev.map((e) => e.type)).toEqual(['protection-trip', 'protection-reset']);
    expect(ev[0]).toMatchObject({ elapsedSeconds: 0, tempCelsius: -4, beyondAtStart: true });
    expect(ev[1]).toMatchObject({ elapsedSeconds: 350, tempCelsius: 3 });
  });
});

describe('heater on/off', () => {
  it('reports on at ~0 °C (32 °F), off at ~5 °C (41 °F), and the mean heater current', () => {
    const n = noise(8);
    // Cools 3 → 0 °C (t 0–300), heater 4 A until 5 °C (t 300–800), then cools again.
    const frames = trace(0, 1000, (t) => {
      const heating = t >= 300 && t < 800;
      const temp = t < 300 ? 3 - t / 100 : heating ? (t - 300) / 100 : 5 - (t - 800) / 100;
      return { volts: 13.3, amps: -2 + n(0.02), temps: { cell: temp + n(0.005) }, aux: { heaterAmps: heating ? 4 + n(0.2) : Math.abs(n(0.02)) } };
    });
    const events = createRunPipeline({}).pushMany(frames).events;
    const on = events.filter((e) => e.type === 'heater-on');
    const off = events.filter((e) => e.type === 'heater-off');
    expect(on).toHaveLength(1);
    expect(off).toHaveLength(1);
    expect(on[0]!.elapsedSeconds).toBe(300);
    expect(on[0]!.tempCelsius!).toBeCloseTo(0, 1);
    expect(off[0]!.elapsedSeconds).toBe(800);
    expect(off[0]!.tempCelsius!).toBeCloseTo(5, 1);
    expect(off[0]!.onSeconds).toBe(500);
    expect(off[0]!.meanHeaterAmps).toBeCloseTo(4, 1);
  });

  it('heater current chattering around the on threshold gives one on and one off', () => {
    const n = noise(9);
    const frames = trace(0, 400, (t) => ({ volts: 13, amps: 0, aux: { heaterAmps: t < 300 ? 0.5 + n(0.25) : 0 } }));
    const events = createRunPipeline({ heaterOnAmps: 0.5, heaterOffAmps: 0.2 }).pushMany(frames).events;
    expect(events.filter((e) => e.type === 'heater-on')).toHaveLength(1);
    expect(events.filter((e) => e.type === 'heater-off')).toHaveLength(1);
  });
  it('a PWM heater (2 s on, 1 s off, sampled at 1 Hz) is one on-period, with its mean and peak current', () => {
    // Heaters driven by pulse-width modulation read 0 A in their off slots (issue 11, item 15).
    // 6 A in the on slots at a 2/3 duty: the element's mean is 6 × 2/3 = 4 A (arithmetic).
    const frames = trace(0, 700, (t) => {
      const heating = t >= 100 && t < 601;
      const slotOn = (t - 100) % 3 < 2;
      return { volts: 53, amps: -3, temps: { cell: heating ? -2 + (t - 100) / 100 : 3 }, aux: { heaterAmps: heating && slotOn ? 6 : 0 } };
    });
    const events = createRunPipeline({}).pushMany(frames).events;
    const on = events.filter((e) => e.type === 'heater-on');
    const off = events.filter((e) => e.type === 'heater-off');
    expect(on).toHaveLength(1);
    expect(off).toHaveLength(1);
    expect(on[0]!.elapsedSeconds).toBe(100);
    expect(on[0]!.tempCelsius).toBe(-2);
    // The last on slot is t = 598-599; t = 600 is an off slot and nothing follows: off at 600.
    expect(off[0]!.elapsedSeconds).toBe(600);
    expect(off[0]!.peakHeaterAmps).toBe(6);
    // Trapezoids between 1 Hz samples of a 2-on/1-off square wave: the ramps count half, still 2/3 on average.
    expect(off[0]!.meanHeaterAmps).toBeCloseTo(4, 1);
    expect(off[0]!.dutyPercent!).toBeCloseTo(66.7, 0);
  });
});
