import type { Config } from 'tailwindcss';

/**
 * Kneepoint's own palette. Bench (dark) surfaces for the lab, paper (light) surfaces for
 * reports. Run-state colours are defined once here and used the same way on every screen.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  darkMode: 'class',
  theme: {
    extend: {
      colors: {
        bench: {
          950: '#0d1117',
          900: '#131a22',
          800: '#1b2430',
          700: '#263241',
          600: '#35465a',
          400: '#8aa0b8',
          200: '#d4dee9',
        },
        paper: { 50: '#fbfaf7', 100: '#f3f1ea', 300: '#d9d4c5', 700: '#4a463c', 900: '#1f1d18' },
        signal: {
          volts: '#f2b134',
          amps: '#3fb6c9',
          watts: '#b58cf0',
          temp: '#ef7d57',
        },
        state: {
          armed: '#7aa2d6',
          recording: '#3fbf7f',
          cutoff: '#e5484d',
          recovered: '#d99a2b',
          finished: '#8c97a6',
          aborted: '#6b5b7b',
        },
      },
      fontFamily: {
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
        sans: ['system-ui', '"Segoe UI"', 'Roboto', 'sans-serif'],
      },
    },
  },
} satisfies Config;
