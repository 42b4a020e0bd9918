import { describe, expect, it } from 'vitest';
import { SimulatorSourceConfigSchema, type BenchStatus } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { ManualClock } from '../testing/manual-clock.js';
import { SimulatorSource } from './simulator-source.js';

const SCENARIO = 'lfp-12v-100ah-cp-cutoff';

describe('SimulatorSource', () => {
  it('plays a scenario at the bench speed with the device clock', async () => {
    const clock = new ManualClock();
    const frames: Frame[] = [];
    const config = SimulatorSourceConfigSchema.parse({ kind: 'simulator', scenario: SCENARIO, speed: 10, seed: 7 });
    const source = new SimulatorSource(config, { frame: (f) => frames.push(f), status: () => undefined }, clock);
    source.start();
    // 10× speed: two real seconds carry twenty simulated seconds (sample period 1 s in this scenario).
    clock.advance(2000);
    expect(frames.length).toBeGreaterThanOrEqual(20);
    expect(frames.length).toBeLessThanOrEqual(21);
    expect(frames.every((f) => f.clock === 'device')).toBe(true);
    expect(frames.map((f) => f.t)).toEqual(frames.map((_f, i) => i));
    // A 600 W load on a full 12.8 V LFP pack draws about 45 to 50 A (P = V·I; common practice).
    expect(frames[5]!.amps).toBeGreaterThan(40);
    expect(frames[5]!.amps).toBeLessThan(55);
    expect(source.getStatus()).toMatchObject({ state: 'receiving', framesOk: frames.length });
    await source.stop();
    const count = frames.length;
    clock.advance(5000);
    expect(frames).toHaveLength(count);
    expect(source.getStatus().state).toBe('idle');
  });

  it('counts frames outside the bench\'s physical bounds as bad, with the reason, and never hands them on', async () => {
    const clock = new ManualClock();
    const frames: Frame[] = [];
    // The scenario's 12.8 V pack under a 600 W load draws about 47 A: a 40 A bound refuses every frame.
    const config = SimulatorSourceConfigSchema.parse({ kind: 'simulator', scenario: SCENARIO, speed: 10, seed: 7, limits: { maxAbsAmps: 40 } });
    const source = new SimulatorSource(config, { frame: (f) => frames.push(f), status: () => undefined }, clock);
    source.start();
    clock.advance(2000);
    const status = source.getStatus();
    expect(status.framesRejected).toBeGreaterThanOrEqual(20);
    expect(status.framesOk).toBe(frames.length);
    expect(frames.every((f) => Math.abs(f.amps) <= 40)).toBe(true);
    expect(status.lastRejection).toMatch(/^amps \d+(\.\d+)? beyond ±40 A$/);
    await source.stop();
  });

  it('turns an unknown scenario into an error status instead of throwing', () => {
    const statuses: BenchStatus[] = [];
    const config = SimulatorSourceConfigSchema.parse({ kind: 'simulator', scenario: 'no-such-thing' });
    const source = new SimulatorSource(config, { frame: () => undefined, status: (s) => statuses.push(s) }, new ManualClock());
    expect(() => source.start()).not.toThrow();
    expect(source.getStatus().state).toBe('error');
    expect(source.getStatus().message).toMatch(/Unknown scenario "no-such-thing"/);
  });
});
