/** Two alternating tones, loud enough to carry across a lab, repeated until acknowledged. */
const TONES_HZ = [880, 660] as const;
const TONE_SECONDS = 0.22;
const REPEAT_MS = 1_200;
const GAIN = 0.35;

type AudioContextLike = Pick<AudioContext, 'currentTime' | 'destination' | 'createOscillator' | 'createGain' | 'resume' | 'state'>;

/**
 * Plays the alarm through WebAudio (no sound file to ship). Several screens may raise an
 * alarm at once; the tone plays while any of them (by key) is active, and only once.
 */
export class AlarmSound {
  private ctx: AudioContextLike | null = null;
  private timer: ReturnType<typeof setInterval> | null = null;
  private readonly active = new Set<string>();

  constructor(private readonly createContext: () => AudioContextLike | null = defaultContext) {}

  /** True while the alarm repeats. */
  get playing(): boolean {
    return this.timer !== null;
  }

  /** Browsers only allow sound after a user gesture: call this from one so later alarms are heard. */
  unlock(): void {
    this.ctx ??= this.createContext();
    if (this.ctx?.state === 'suspended') void this.ctx.resume().catch(() => undefined);
  }

  /** Starts (or keeps) the alarm for `key`; harmless when audio is unavailable. */
  start(key = 'default'): void {
    this.active.add(key);
    if (this.timer !== null) return;
    this.unlock();
    if (!this.ctx) return;
    this.beep();
    this.timer = setInterval(() => this.beep(), REPEAT_MS);
  }

  /** Stops the alarm for `key`; the tone ends when no key is left. */
  stop(key = 'default'): void {
    this.active.delete(key);
    if (this.active.size > 0) return;
    if (this.timer !== null) clearInterval(this.timer);
    this.timer = null;
  }

  private beep(): void {
    const ctx = this.ctx;
    if (!ctx) return;
    TONES_HZ.forEach((hz, i) => {
      const osc = ctx.createOscillator();
      const gain = ctx.createGain();
      osc.type = 'square';
      osc.frequency.value = hz;
      gain.gain.value = GAIN;
      osc.connect(gain).connect(ctx.destination);
      const at = ctx.currentTime + i * TONE_SECONDS;
      osc.start(at);
      osc.stop(at + TONE_SECONDS * 0.9);
    });
  }
}

function defaultContext(): AudioContextLike | null {
  const Ctor = typeof window !== 'undefined' ? window.AudioContext : undefined;
  return Ctor ? new Ctor() : null;
}

/** The app's one alarm sound. */
export const sharedAlarmSound = new AlarmSound();

/** Unlocks audio on the first click or key press anywhere, so an alarm hours later is heard. */
export function installAudioUnlock(target: Window = window): void {
  const unlock = () => {
    sharedAlarmSound.unlock();
    target.removeEventListener('pointerdown', unlock);
    target.removeEventListener('keydown', unlock);
  };
  target.addEventListener('pointerdown', unlock);
  target.addEventListener('keydown', unlock);
}
