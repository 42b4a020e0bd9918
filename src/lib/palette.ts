/**
 * Kneepoint's own colours, defined once. tailwind.config.ts builds its theme from this file,
 * and charts and legends read the same values, so a state looks the same on every screen.
 */

/** Run lifecycle states (persisted by the server) and the colour each one wears. */
export const RUN_STATE_COLORS = {
  armed: '#6f9fe0',
  recording: '#35c27a',
  cutoff: '#f0454b',
  recovered: '#e0a12a',
  finished: '#8e9bab',
  aborted: '#9a7bb8',
} as const;

export type RunStateName = keyof typeof RUN_STATE_COLORS;

/** Bench source health, from "all good" to "needs a hand". */
export const BENCH_STATUS_COLORS = {
  receiving: '#35c27a',
  connected: '#6f9fe0',
  stale: '#e0a12a',
  error: '#f0454b',
  idle: '#5d6b7c',
} as const;

export type BenchStatusName = keyof typeof BENCH_STATUS_COLORS;

/** One colour per measured quantity: chart series, big numbers and legends share them. */
export const SIGNAL_COLORS = {
  volts: '#f4b63f',
  amps: '#3db8cc',
  watts: '#b890f2',
  temp: '#f07f59',
} as const;

export type SignalName = keyof typeof SIGNAL_COLORS;

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

/** Line colours for runs laid over each other on the compare page (in selection order). */
export const COMPARE_COLORS = ['#f4b63f', '#3db8cc', '#e86aa8', '#8fd16a'] as const;
