import type { CapacityEndedBy, RunSummary } from '../../../../shared/schemas/run-summary';
import { percentShown } from '../../../../shared/measure/figures';
import { STANDARD_RATE_C, STANDARD_TEMP_CELSIUS, STANDARD_TEMP_TOLERANCE_CELSIUS } from '../../../../shared/measure/test-conditions';
import { formatDuration, formatNumber, formatPercent, formatTemperature } from '../../../lib/units';

/** What the capacity figure is measured to, as its tile says it. */
export const CAPACITY_LABEL: Partial<Record<CapacityEndedBy, string>> = {
  'end-voltage': 'Capacity to the end voltage',
  protection: 'Capacity to the protection trip',
  'run-end': 'Capacity, whole run (no end voltage set)',
};

/** Why a run has no capacity figure, in a sentence. */
export const INCOMPLETE_REASON: Partial<Record<CapacityEndedBy, string>> = {
  'started-below-end-voltage': 'Started below the end voltage: the pack was already empty by this test’s measure, so no capacity was measured.',
  'stopped-before-end-voltage': 'Stopped before the end voltage: the capacity was not reached, so there is no verdict. The whole-run totals below are what came out.',
  'in-progress': 'In progress: the end voltage is not reached yet.',
  'no-discharge': 'No discharge under load in this run, so no capacity was measured.',
};

/** A percentage of rated as shown beside the verdict: rounded down, as the verdict judges it. */
export function formatPercentOfRated(percent: number | null): string {
  return formatPercent(percent === null ? null : percentShown(percent));
}

/** "0.20 C" with the standard's rate beside it when the run was outside it. */
export function rateText(s: RunSummary): string {
  if (s.cRate === null) return 'Rate unknown (no rating)';
  const rate = `${formatNumber(s.cRate, 2)} C`;
  return s.rateOutsideStandard ? `${rate}, outside the ${STANDARD_RATE_C} C that IEC 61960-3 rates capacity at (from memory)` : rate;
}

/** The temperature range under load, with the standard's range beside it when outside. */
export function temperatureText(s: RunSummary, unit: 'C' | 'F'): string {
  if (s.testMinTempCelsius === null || s.testMaxTempCelsius === null) return 'Temperature not recorded';
  const range =
    s.testMinTempCelsius === s.testMaxTempCelsius
      ? formatTemperature(s.testMinTempCelsius, unit)
      : `${formatTemperature(s.testMinTempCelsius, unit)} to ${formatTemperature(s.testMaxTempCelsius, unit)}`;
  if (!s.tempOutsideStandard) return `${range} under load`;
  const low = formatTemperature(STANDARD_TEMP_CELSIUS - STANDARD_TEMP_TOLERANCE_CELSIUS, unit);
  const high = formatTemperature(STANDARD_TEMP_CELSIUS + STANDARD_TEMP_TOLERANCE_CELSIUS, unit);
  return `${range} under load, outside the ${low} to ${high} of IEC 61960-3 (from memory)`;
}

/** The gap count and the limit they were judged by. */
export function gapsText(s: RunSummary): string {
  const count = `${s.gaps} (${formatDuration(s.gapSeconds)})`;
  if (s.maxGapSeconds === null) return count;
  const basis =
    s.gapLimitBasis === 'cadence' && s.cadenceSeconds !== null
      ? `from the meter's pace of one reading every ${formatDuration(s.cadenceSeconds)}`
      : s.gapLimitBasis === 'explicit'
        ? 'set on the run'
        : 'default';
  return `${count}; limit ${formatDuration(s.maxGapSeconds)}, ${basis}`;
}
