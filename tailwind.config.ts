import type { Config } from 'tailwindcss';
import { BENCH_STATUS_COLORS, NEUTRALS, RUN_STATE_COLORS, SIGNAL_COLORS } from './src/lib/palette';

/**
 * Kneepoint's own palette. Semantic colours (surface, ink, line, accent) point at CSS
 * variables set in src/styles.css for the dark "bench" theme and the light "report" theme;
 * run-state, bench-status and signal colours come from src/lib/palette.ts, defined once.
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
      },
      fontFamily: {
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
        sans: ['system-ui', '"Segoe UI"', 'Roboto', '"Helvetica Neue"', 'sans-serif'],
      },
    },
  },
} satisfies Config;
