import { afterEach, describe, expect, it, vi } from 'vitest';
import { AlarmSound } from './alarm-sound';

function fakeContext() {
  const started: number[] = [];
  const node = () => ({ connect: (n: unknown) => n, frequency: { value: 0 }, gain: { value: 0 }, type: '', start: (at: number) => started.push(at), stop: () => undefined });
  const ctx = { currentTime: 0, destination: {}, state: 'running', resume: vi.fn(async () => undefined), createOscillator: node, createGain: node };
  return { ctx: ctx as unknown as AudioContext, started };
}

describe('AlarmSound', () => {
  afterEach(() => vi.useRealTimers());

  it('beeps at once and repeats until every screen that raised it has stopped', () => {
    vi.useFakeTimers();
    const { ctx, started } = fakeContext();
    const sound = new AlarmSound(() => ctx);
    sound.start('run:1');
    sound.start('run:2');
    expect(started).toHaveLength(2); // two tones, one beep: a second alarm does not double it
    vi.advanceTimersByTime(1_200);
    expect(started).toHaveLength(4);
    sound.stop('run:1');
    expect(sound.playing).toBe(true);
    sound.stop('run:2');
    expect(sound.playing).toBe(false);
    vi.advanceTimersByTime(5_000);
    expect(started).toHaveLength(4);
  });

  it('stays silent without WebAudio instead of throwing', () => {
    const sound = new AlarmSound(() => null);
    expect(() => sound.start()).not.toThrow();
    expect(sound.playing).toBe(false);
  });
});
