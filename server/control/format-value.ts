import { VALUE_PLACEHOLDER } from '../../shared/schemas/instrument-driver.js';

/** Decimals written into a command: micro-units, finer than any bench instrument resolves. */
const COMMAND_DECIMALS = 6;

/** Writes a number as plain decimals (no exponent, no trailing zeros), as SCPI NR2 accepts. */
export function formatCommandNumber(value: number): string {
  return String(Number(value.toFixed(COMMAND_DECIMALS)));
}

/** Fills `{value}` in a command template. */
export function fillTemplate(template: string, value: number): string {
  return template.split(VALUE_PLACEHOLDER).join(formatCommandNumber(value));
}
