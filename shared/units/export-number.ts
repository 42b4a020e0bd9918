/**
 * Numbers in exported files: rounded to a column's meaningful digits and written in plain
 * decimal, never with float noise (595.3199999999) or scientific notation (7.39e-8).
 * Trailing zeros are dropped (13.2 rather than 13.2000); minus zero is written as 0.
 */
export function formatExportNumber(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return '';
  const rounded = Number(value.toFixed(decimals));
  if (rounded === 0) return '0';
  const text = String(rounded);
  // Past 1e21 String() switches to exponent form; toFixed keeps plain digits there.
  return /e/i.test(text) ? rounded.toFixed(decimals).replace(/\.?0+$/, '') : text;
}

/**
 * Decimals kept per exported quantity, matched to what a bench meter resolves: time to 1 ms,
 * volts and amps to 0.1 mV / 0.1 mA (a 5½-digit meter on its usual ranges), watts to 1 mW,
 * Wh and Ah to 0.1 mWh / 0.1 mAh, temperatures to 0.01 °C, any other channel to 4 decimals.
 */
export const EXPORT_DECIMALS = {
  time: 3,
  volts: 4,
  amps: 4,
  watts: 3,
  energy: 4,
  charge: 4,
  temperature: 2,
  other: 4,
} as const;
