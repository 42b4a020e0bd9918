/**
 * The client's door to shared/units: every number on screen is formatted there, so screens,
 * exports and reports agree. This file only splits "25.60 V" into number and unit for the
 * big readouts, where the unit is drawn smaller beside the number.
 */
export * from '../../shared/units/index';
import { NO_VALUE } from '../../shared/units/index';

/** A formatted quantity split into its number and its unit ("25.60 V" → 25.60 and V). */
export function splitQuantity(text: string, unit: string): { value: string; unit: string } {
  if (text === NO_VALUE) return { value: NO_VALUE, unit };
  const at = text.lastIndexOf(' ');
  return at < 0 ? { value: text, unit } : { value: text.slice(0, at), unit: text.slice(at + 1) };
}
