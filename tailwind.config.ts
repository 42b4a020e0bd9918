import type { Config } from 'tailwindcss';
import { BENCH_STATUS_COLORS, NEUTRALS, ON_TONE_COLOR, RUN_STATE_COLORS, SIGNAL_COLORS, TONE_COLORS } from './src/lib/palette';

/**
 * Kneepoint's own palette. Semantic colours (surface, ink, line, accent) point at CSS
 * variables set in src/styles.css for the dark "bench" theme and the light "report" theme;
 * run-state, bench-status, tone and signal colours come from src/lib/palette.ts, defined once
 * for both looks (CSS variables installed by main.tsx).
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  darkMode: 'class',
  theme: {
    extend: {
      colors: {
        ...NEUTRALS,
        surface: {
          DEFAULT: 'var(--kp-surface)',
          raised: 'var(--kp-surface-raised)',
          sunken: 'var(--kp-surface-sunken)',
        },
        ink: { DEFAULT: 'var(--kp-ink)', muted: 'var(--kp-ink-muted)', faint: 'var(--kp-ink-faint)' },
        line: 'var(--kp-line)',
        accent: { DEFAULT: 'var(--kp-accent)', ink: 'var(--kp-accent-ink)' },
        caution: { DEFAULT: 'var(--kp-caution)', surface: 'var(--kp-caution-surface)' },
        signal: SIGNAL_COLORS,
        state: RUN_STATE_COLORS,
        status: BENCH_STATUS_COLORS,
        tone: TONE_COLORS,
        'on-tone': ON_TONE_COLOR,
      },
      fontFamily: {
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
        sans: ['system-ui', '"Segoe UI"', 'Roboto', '"Helvetica Neue"', 'sans-serif'],
      },
    },
  },
} satisfies Config;
