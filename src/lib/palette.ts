/**
 * Kneepoint's own colours, defined once, for both looks. Every colour has one meaning:
 * a tone says how things stand (good, waiting, caution, fault, over, aborted), a signal colour
 * names one measured quantity, and no value serves two meanings. Each value reaches WCAG 2.2 AA
 * against its theme's surfaces (4.5:1 as text, so also 3:1 as a line or badge border);
 * palette.test.ts checks every pair. Components use the `var(--kp-…)` names below, so a colour
 * follows the theme without a re-render; canvases resolve them with `resolveColor`.
 */

/** A colour for the light "report" look and one for the dark "bench" look. */
export interface ThemedColor {
  light: string;
  dark: string;
}

/** Surfaces text sits on, per theme (surface, raised, sunken), for the contrast checks. */
export const SURFACES = {
  light: ['#fbfaf6', '#ffffff', '#f1eee4'],
  dark: ['#0b0f14', '#141b24', '#080b0f'],
} as const;

/** Text drawn on a filled tone (a verdict, the alarm banner, a danger button). */
export const ON_TONE: ThemedColor = { light: '#ffffff', dark: '#0b0f14' };

/** How things stand. Each tone is one meaning, used by every state that means it. */
export const TONES = {
  /** Going as it should: a recording run, a source receiving, a passing verdict. */
  good: { light: '#15773e', dark: '#21bd62' },
  /** Ready and waiting: an armed run, a source connected but not yet sending. */
  waiting: { light: '#2463ce', dark: '#7fa6e8' },
  /** Look at it: recovered after a cutoff, no data, reconnecting, a gap. */
  caution: { light: '#905d04', dark: '#e59306' },
  /** Stopped by a fault: cutoff, source error, failed verdict, critical alarm. */
  fault: { light: '#cb1d29', dark: '#ff5c63' },
  /** Over or not applicable: finished, idle, unrated. */
  over: { light: '#5f6874', dark: '#9ea6b0' },
  /** Stopped by a person before the end. */
  aborted: { light: '#79634e', dark: '#b6a28d' },
} as const satisfies Record<string, ThemedColor>;

export type ToneName = keyof typeof TONES;

/** One colour per measured quantity: chart series, big numbers and legends share them. */
export const SIGNAL_TONES = {
  volts: { light: '#7b46d8', dark: '#b698e9' },
  amps: { light: '#0b7089', dark: '#12b3db' },
  watts: { light: '#b62d8d', dark: '#e879c9' },
  temp: { light: '#b6410f', dark: '#f2895c' },
} as const satisfies Record<string, ThemedColor>;

export type SignalName = keyof typeof SIGNAL_TONES;

/** Run lifecycle states (persisted by the server) and the tone each one wears. */
export const RUN_STATE_TONE = {
  armed: 'waiting',
  recording: 'good',
  cutoff: 'fault',
  recovered: 'caution',
  finished: 'over',
  aborted: 'aborted',
} as const satisfies Record<string, ToneName>;

export type RunStateName = keyof typeof RUN_STATE_TONE;

/** Bench source health, from "all good" to "needs a hand". */
export const BENCH_STATUS_TONE = {
  receiving: 'good',
  connected: 'waiting',
  stale: 'caution',
  error: 'fault',
  idle: 'over',
} as const satisfies Record<string, ToneName>;

export type BenchStatusName = keyof typeof BENCH_STATUS_TONE;

/** A CSS colour that follows the theme. */
const toneVar = (tone: ToneName) => `var(--kp-tone-${tone})`;
const signalVar = (signal: SignalName) => `var(--kp-signal-${signal})`;

function mapValues<K extends string, V, R>(record: Record<K, V>, fn: (value: V, key: K) => R): Record<K, R> {
  return Object.fromEntries(Object.entries(record).map(([k, v]) => [k, fn(v as V, k as K)])) as Record<K, R>;
}

/** The colour of each run state (a CSS variable that follows the theme). */
export const RUN_STATE_COLORS: Record<RunStateName, string> = mapValues(RUN_STATE_TONE, toneVar);
/** The colour of each bench source state. */
export const BENCH_STATUS_COLORS: Record<BenchStatusName, string> = mapValues(BENCH_STATUS_TONE, toneVar);
/** The colour of each measured quantity. */
export const SIGNAL_COLORS: Record<SignalName, string> = mapValues(SIGNAL_TONES, (_v, name) => signalVar(name));
/** The colour of each tone. */
export const TONE_COLORS: Record<ToneName, string> = mapValues(TONES, (_v, name) => toneVar(name));
/** A person's note on a timeline or chart: the muted ink, not a tone or a signal. */
export const NOTE_COLOR = 'var(--kp-ink-muted)';
/** Text on a filled tone. */
export const ON_TONE_COLOR = 'var(--kp-on-tone)';

/** Line colours for runs laid over each other on the compare page (in selection order); used nowhere else. */
export const COMPARE_TONES: readonly ThemedColor[] = [
  { light: '#946300', dark: '#f4b63f' },
  { light: '#0b7089', dark: '#3db8cc' },
  { light: '#b62d8d', dark: '#e86aa8' },
  { light: '#2f7d1f', dark: '#8fd16a' },
];
/** The compare colours as CSS variables. */
export const COMPARE_COLORS: readonly string[] = COMPARE_TONES.map((_c, i) => `var(--kp-compare-${i})`);

/** Neutral ramps: "bench" for the dark lab theme, "paper" for the light report theme. */
export const NEUTRALS = {
  bench: {
    950: '#0b0f14',
    900: '#11171f',
    850: '#161e28',
    800: '#1c2633',
    700: '#283546',
    600: '#3a4b60',
    400: '#8a9fb6',
    200: '#d5dfea',
    100: '#eef3f8',
  },
  paper: {
    50: '#fbfaf6',
    100: '#f4f1e8',
    200: '#e8e3d5',
    300: '#d6cfbc',
    500: '#8a8272',
    700: '#4a463c',
    900: '#1f1d18',
  },
} as const;

/** Every themed colour as `--name: value` pairs for one look. */
export function paletteVariables(theme: keyof ThemedColor): Record<string, string> {
  const vars: Record<string, string> = { '--kp-on-tone': ON_TONE[theme] };
  for (const [name, c] of Object.entries(TONES)) vars[`--kp-tone-${name}`] = c[theme];
  for (const [name, c] of Object.entries(SIGNAL_TONES)) vars[`--kp-signal-${name}`] = c[theme];
  COMPARE_TONES.forEach((c, i) => (vars[`--kp-compare-${i}`] = c[theme]));
  return vars;
}

const block = (selector: string, vars: Record<string, string>) =>
  `${selector}{${Object.entries(vars)
    .map(([k, v]) => `${k}:${v}`)
    .join(';')}}`;

/** The stylesheet that defines the variables: light on :root, dark on .dark, light again in print. */
export function paletteCss(): string {
  const light = paletteVariables('light');
  return [block(':root', light), block('.dark', paletteVariables('dark')), `@media print{${block(':root,.dark', light)}}`].join('\n');
}

/** A colour a canvas can use: `var(--x)` read from the document, anything else as given. */
export function resolveColor(color: string): string {
  const match = /^var\((--[\w-]+)\)$/.exec(color);
  if (!match || typeof document === 'undefined') return color;
  return getComputedStyle(document.documentElement).getPropertyValue(match[1]).trim() || color;
}
