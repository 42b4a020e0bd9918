import { describe, expect, it } from 'vitest';
import { BENCH_STATUS_TONE, COMPARE_TONES, ON_TONE, paletteCss, RUN_STATE_TONE, SIGNAL_TONES, SURFACES, TONES, type ThemedColor } from './palette';

/** Relative luminance and contrast ratio as defined in WCAG 2.2, "relative luminance" and "contrast ratio" (Understanding SC 1.4.3). */
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

/** WCAG 2.2 SC 1.4.3: 4.5:1 for normal text; SC 1.4.11: 3:1 for graphics (chart lines). */
const TEXT_MIN = 4.5;
const GRAPHICS_MIN = 3;
const themes = ['light', 'dark'] as const;

describe('contrast formula', () => {
  it('matches the WCAG end points: black on white is 21:1, a colour on itself 1:1', () => {
    // WCAG 2.2 Understanding SC 1.4.3: ratios range from 1:1 to 21:1.
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrast('#15773e', '#15773e')).toBeCloseTo(1, 5);
  });
});

describe('palette', () => {
  const texty: [string, ThemedColor][] = [...Object.entries(TONES), ...Object.entries(SIGNAL_TONES)];
  for (const theme of themes) {
    it(`every tone and signal reads as text on every ${theme} surface (4.5:1)`, () => {
      for (const [name, color] of texty) for (const surface of SURFACES[theme]) expect(contrast(color[theme], surface), `${name} on ${surface}`).toBeGreaterThanOrEqual(TEXT_MIN);
    });
    it(`text on a filled tone reads in the ${theme} look (4.5:1)`, () => {
      for (const [name, color] of Object.entries(TONES)) expect(contrast(ON_TONE[theme], color[theme]), name).toBeGreaterThanOrEqual(TEXT_MIN);
    });
    it(`compare lines stand out as graphics in the ${theme} look (3:1)`, () => {
      for (const color of COMPARE_TONES) for (const surface of SURFACES[theme]) expect(contrast(color[theme], surface)).toBeGreaterThanOrEqual(GRAPHICS_MIN);
    });
  }

  it('gives each colour one meaning: no value is both a tone and a signal, and no two tones or signals share one', () => {
    for (const theme of themes) {
      const values = texty.map(([, c]) => c[theme].toLowerCase());
      expect(new Set(values).size).toBe(values.length);
    }
  });

  it('maps states to tones, so a state and a signal never share a colour (aborted is not the watts colour)', () => {
    expect(RUN_STATE_TONE.aborted).toBe('aborted');
    expect(TONES.aborted.light).not.toBe(SIGNAL_TONES.watts.light);
    expect(TONES.aborted.dark).not.toBe(SIGNAL_TONES.watts.dark);
    for (const tone of [...Object.values(RUN_STATE_TONE), ...Object.values(BENCH_STATUS_TONE)]) expect(Object.keys(TONES)).toContain(tone);
  });

  it('defines the light values on :root, the dark ones on .dark, and light again for print', () => {
    const css = paletteCss();
    expect(css).toContain(`:root{--kp-on-tone:${ON_TONE.light}`);
    expect(css).toContain(`.dark{--kp-on-tone:${ON_TONE.dark}`);
    expect(css).toMatch(/@media print\{:root,\.dark\{--kp-on-tone:#ffffff/);
  });
});
