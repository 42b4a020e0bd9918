import type { Chemistry } from '../../../../shared/schemas/battery';
import type { RunKind } from '../../../../shared/schemas/run';
import { formatTemperature } from '../../../lib/units';

/** Below this, charging a lithium cell plates lithium (common practice: no charge below 0 °C). */
const LITHIUM_MIN_CHARGE_CELSIUS = 0;
const LITHIUM: readonly Chemistry[] = ['lfp', 'nmc', 'nca', 'lco', 'lmo', 'lto'];

/** The cautions that apply to this pack and this test, most serious first, temperatures in the lab's unit. */
export function contextualCautions(
  chemistry: Chemistry | null,
  kind: RunKind,
  packCelsius: number | null,
  temperatureUnit: 'C' | 'F' = 'C',
): { text: string; severe: boolean }[] {
  const freezing = formatTemperature(LITHIUM_MIN_CHARGE_CELSIUS, temperatureUnit, 0);
  const out: { text: string; severe: boolean }[] = [];
  const lithium = chemistry !== null && LITHIUM.includes(chemistry);
  const charging = kind === 'charge' || kind === 'protection-check';
  if (lithium && charging && packCelsius !== null && packCelsius < LITHIUM_MIN_CHARGE_CELSIUS) {
    out.push({
      text: `The bench reads ${formatTemperature(packCelsius, temperatureUnit)}: do not charge a lithium pack below ${freezing} unless you are testing its cold-charge protection and its heater, and someone watches it.`,
      severe: true,
    });
  } else if (lithium && charging) {
    out.push({ text: `Check the pack is above ${freezing} before charging: charging lithium cells below freezing damages them.`, severe: false });
  }
  if (kind === 'protection-check') {
    out.push({
      text: "A protection check drives the pack past its limits (heat, over-current, over- and under-voltage) on purpose: stay with it, keep a way to cut the charger and load by hand, and follow the maker's instructions and local codes. If the protection does not act, stop the test yourself.",
      severe: false,
    });
  }
  if (chemistry === 'lead-acid') {
    out.push({ text: 'Lead-acid gives off hydrogen on charge and at the end of a discharge: ventilate and keep sparks away.', severe: false });
  }
  if (lithium) out.push({ text: 'Lithium pack: non-combustible surface, extinguisher at hand, nothing flammable near the bench.', severe: false });
  return out;
}
