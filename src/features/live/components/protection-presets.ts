import type { TempProtection } from '../../../../shared/schemas/measure-config';
import { fahrenheitToCelsius } from '../../../lib/units';

/** Common practice for lithium packs: no charging below 0 °C; a hot cutoff near 60 °C (check the datasheet). */
export const COLD_CHARGE_LIMIT_CELSIUS = 0;
export const HOT_LIMIT_CELSIUS = 60;

/** What the technician ticked on the start form, limits as typed in the lab's unit (empty = the common default). */
export interface ProtectionChoice {
  coldCharge: boolean;
  coldLimit: string;
  hot: boolean;
  hotLimit: string;
}

function toCelsius(text: string, unit: 'C' | 'F', defaultCelsius: number): number {
  if (text.trim() === '') return defaultCelsius;
  return unit === 'F' ? fahrenheitToCelsius(Number(text)) : Number(text);
}

/**
 * The temperature protections a protection check times, on the bench's temperature channel:
 * cold-charge inhibit (charging must stop below the limit) and the high-temperature cutoff.
 */
export function tempProtectionsFrom(choice: ProtectionChoice, unit: 'C' | 'F', channel: string): TempProtection[] {
  const out: TempProtection[] = [];
  if (choice.coldCharge) out.push({ kind: 'low-temp-charge', channel, limitCelsius: toCelsius(choice.coldLimit, unit, COLD_CHARGE_LIMIT_CELSIUS), direction: 'below', current: 'charge' });
  if (choice.hot) out.push({ kind: 'high-temp', channel, limitCelsius: toCelsius(choice.hotLimit, unit, HOT_LIMIT_CELSIUS), direction: 'above', current: 'any' });
  return out;
}
