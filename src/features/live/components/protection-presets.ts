import type { TempProtection } from '../../../../shared/schemas/measure-config';
import { fahrenheitToCelsius } from '../../../lib/units';

/** Common practice for lithium packs: no charging below 0 °C; a hot cutoff near 60 °C (check the datasheet). */
export const COLD_CHARGE_LIMIT_CELSIUS = 0;
export const HOT_LIMIT_CELSIUS = 60;

/** What the technician ticked on the start form, limits as typed in the lab's unit. */
export interface ProtectionChoice {
  coldCharge: boolean;
  coldLimit: string;
  hot: boolean;
  hotLimit: string;
}

const toCelsius = (text: string, unit: 'C' | 'F') => (unit === 'F' ? fahrenheitToCelsius(Number(text)) : Number(text));

/**
 * The temperature protections a protection check times, on the bench's temperature channel:
 * cold-charge inhibit (charging must stop below the limit) and the high-temperature cutoff.
 */
export function tempProtectionsFrom(choice: ProtectionChoice, unit: 'C' | 'F', channel: string): TempProtection[] {
  const out: TempProtection[] = [];
  if (choice.coldCharge) out.push({ kind: 'low-temp-charge', channel, limitCelsius: toCelsius(choice.coldLimit, unit), direction: 'below', current: 'charge' });
  if (choice.hot) out.push({ kind: 'high-temp', channel, limitCelsius: toCelsius(choice.hotLimit, unit), direction: 'above', current: 'any' });
  return out;
}
