/** Two alternating tones, loud enough to carry across a lab, repeated until acknowledged. */
const TONES_HZ = [880, 660] as const;
const TONE_SECONDS = 0.22;
const REPEAT_MS = 1_200;
const GAIN = 0.35;

type AudioContextLike = Pick<AudioContext, 'currentTime' | 'destination' | 'createOscillator' | 'createGain' | 'resume' | 'state'>;

/** Plays the cutoff alarm through WebAudio (no sound file to ship). */
export class AlarmSound {
  private ctx: AudioContextLike | null = null;
  private timer: ReturnType<typeof setInterval> | null = null;

  constructor(private readonly createContext: () => AudioContextLike | null = defaultContext) {}

  /** True while the alarm repeats. */
  get playing(): boolean {
    return this.timer !== null;
  }

  /** Starts repeating the alarm; harmless when already playing or when audio is unavailable. */
  start(): void {
    if (this.timer !== null) return;
    this.ctx ??= this.createContext();
    if (!this.ctx) return;
    if (this.ctx.state === 'suspended') void this.ctx.resume().catch(() => undefined);
    this.beep();
    this.timer = setInterval(() => this.beep(), REPEAT_MS);
  }

  /** Stops the alarm. */
  stop(): void {
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
