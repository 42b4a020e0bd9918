import fc from 'fast-check';
import { format } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { formatExportNumber } from './export-number.js';

/** mathjs's fixed notation (a general-purpose reference library), trailing zeros dropped. */
function reference(value: number, decimals: number): string {
  const fixed = format(value, { notation: 'fixed', precision: decimals });
  const trimmed = fixed.includes('.') ? fixed.replace(/\.?0+$/, '') : fixed;
  return trimmed === '-0' ? '0' : trimmed;
}

describe('formatExportNumber', () => {
  it('writes float noise and tiny values in plain decimals', () => {
    // 13.2 × 45.1 = 595.32 exactly in decimal; binary floating point gives 595.3199999999999.
    expect(13.2 * 45.1).not.toBe(595.32);
    expect(formatExportNumber(13.2 * 45.1, 3)).toBe('595.32');
    expect(formatExportNumber(7.39e-8, 4)).toBe('0');
    expect(formatExportNumber(-1e-9, 4)).toBe('0');
    expect(formatExportNumber(0.00016, 4)).toBe(reference(0.00016, 4));
    expect(formatExportNumber(Number.NaN, 4)).toBe('');
  });

  it('agrees with mathjs fixed notation for any value and never uses an exponent', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e7, max: 1e7, noNaN: true }), fc.integer({ min: 0, max: 6 }), (value, decimals) => {
        const text = formatExportNumber(value, decimals);
        expect(text).not.toMatch(/e/i);
        // Within one unit of the last kept digit: the two round a binary tie (…5) differently.
        expect(Math.abs(Number(text) - Number(reference(value, decimals)))).toBeLessThanOrEqual(10 ** -decimals * 1.000001);
      }),
      { numRuns: 2000 },
    );
  });
});
