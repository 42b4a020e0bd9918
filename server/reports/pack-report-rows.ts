import { capacityTrend } from '../../shared/measure/capacity-trend.js';
import type { Battery } from '../../shared/schemas/battery.js';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import { PROTECTION_TRAITS, type Protection, type ProtectionRecordRow, type ProtectionResult, type ProtectionSpec } from '../../shared/schemas/protection-check.js';
import type { Run } from '../../shared/schemas/run.js';
import { formatAmps, formatCharge, formatDuration, formatEnergy, formatNumber, formatPercent, formatTemperature, formatVolts, NO_VALUE } from '../../shared/units/format.js';
import { labTime } from './pdf-layout.js';

const MONTHS_PER_YEAR = 12;

/** A protection's threshold or reading in its unit, temperatures in the lab's unit. */
export function protectionValue(protection: Protection, value: number | null, settings: Pick<LabSettings, 'temperatureUnit'>): string {
  const unit = PROTECTION_TRAITS[protection].unit;
  if (unit === '°C') return formatTemperature(value, settings.temperatureUnit);
  return unit === 'V' ? formatVolts(value) : formatAmps(value);
}

const when = (iso: string | null, timeZone: string) => (iso ? labTime(new Date(iso), timeZone) : NO_VALUE);

/** The pack's specification as label and value, every number with its unit; the price only when asked. Internal fields (notes, sender, owner) are never printed. */
export function packSpecRows(b: Battery, settings: LabSettings, includePrices: boolean): Array<[string, string]> {
  const sides = [b.lengthMm, b.widthMm, b.heightMm];
  const rows: Array<[string, string | null]> = [
    ['Brand / model', [b.brand, b.model].filter(Boolean).join(' ')],
    ['Chemistry', b.chemistry],
    ['Cells', `${b.cellsInSeries}S${b.cellsInParallel > 1 ? `${b.cellsInParallel}P` : ''}`],
    ['Rated capacity', formatCharge(b.ratedAh)],
    ['Rated energy', b.ratedWh === null ? null : formatEnergy(b.ratedWh, settings.energyUnit)],
    ['Protection current', b.bmsRatedAmps === null ? null : `${formatNumber(b.bmsRatedAmps, 0)} A`],
    ['Mass', b.massKg === null ? null : `${formatNumber(b.massKg, 2)} kg`],
    ['Dimensions (L × W × H)', sides.every((s) => s === null) ? null : `${sides.map((s) => (s === null ? '?' : formatNumber(s, 0))).join(' × ')} mm`],
    ['Terminals', b.terminalType],
    ['Stated cycle life', b.statedCycleLife === null ? null : `${b.statedCycleLife} cycles`],
    ['Warranty', b.warrantyMonths === null ? null : b.warrantyMonths % MONTHS_PER_YEAR === 0 && b.warrantyMonths > 0 ? `${b.warrantyMonths / MONTHS_PER_YEAR} years` : `${b.warrantyMonths} months`],
    ['Serial number', b.serialNumber],
    ['Received', b.receivedOn],
    ...(includePrices ? [['Price', b.price === null ? null : `${formatNumber(b.price, 2)} ${b.priceCurrency ?? ''}`.trim()] as [string, string | null]] : []),
  ];
  return rows.map(([label, value]) => [label, value || NO_VALUE]);
}

/** Column headers of the capacity history. */
export const CAPACITY_HEADERS = ['Date', 'Run', 'Capacity', 'Energy', '% of rated Ah', '% of rated Wh', 'Verdict'];

/** The capacity history: each finished capacity run, oldest first, with date (lab's zone), Ah, Wh (lab's unit), % of rated and verdict. */
export function capacityRows(b: Battery, runs: readonly Run[], settings: LabSettings): string[][] {
  const verdictOf = new Map(runs.map((r) => [r.id, r.summary?.verdict ?? NO_VALUE]));
  return capacityTrend(runs, { ratedAh: b.ratedAh, ratedWh: b.ratedWh }).map((p) => [
    when(p.at, settings.timeZone),
    p.runName,
    formatCharge(p.deliveredAh),
    formatEnergy(p.deliveredWh, settings.energyUnit),
    formatPercent(p.percentRatedAh),
    formatPercent(p.percentRatedWh),
    verdictOf.get(p.runId)!,
  ]);
}

/** What the maker states for each protection, one line each. */
export function protectionSpecLines(specs: readonly ProtectionSpec[], settings: LabSettings): string[] {
  return specs.map((s) => {
    const delay = s.delaySeconds === null ? '' : ` after ${formatDuration(s.delaySeconds)}`;
    const release = s.releaseValue === null ? '' : `, released at ${protectionValue(s.protection, s.releaseValue, settings)}`;
    return `${PROTECTION_TRAITS[s.protection].label}: ${protectionValue(s.protection, s.thresholdValue, settings)}${delay}${release}`;
  });
}

/** One protection result in words: "Over-temperature, discharging: pass (expected 60.0 °C after 5 s, measured 61.2 °C after 5 s)". */
export function protectionResultLine(r: ProtectionResult, settings: Pick<LabSettings, 'temperatureUnit'>): string {
  const at = (value: number | null, delay: number | null) => `${protectionValue(r.protection, value, settings)}${delay === null ? '' : ` after ${formatDuration(delay)}`}`;
  return `${PROTECTION_TRAITS[r.protection].label}: ${r.outcome} (expected ${at(r.expectedValue, r.expectedDelaySeconds)}, measured ${at(r.measuredValue, r.measuredDelaySeconds)})`;
}

/** Column headers of the protection record. */
export const PROTECTION_HEADERS = ['Run', 'Protection', 'Expected', 'Measured', 'Result'];

/** The protection record: each protection checked, latest run first. */
export function protectionRows(rows: readonly ProtectionRecordRow[], settings: LabSettings): string[][] {
  const withDelay = (protection: Protection, value: number | null, delay: number | null) =>
    `${protectionValue(protection, value, settings)}${delay === null ? '' : ` after ${formatDuration(delay)}`}`;
  return rows.map((r) => [
    `${r.runName}, ${when(r.startedAt, settings.timeZone)}`,
    PROTECTION_TRAITS[r.protection].label,
    withDelay(r.protection, r.expectedValue, r.expectedDelaySeconds),
    withDelay(r.protection, r.measuredValue, r.measuredDelaySeconds),
    r.outcome,
  ]);
}

/** Column headers of the runs list. */
export const RUN_HEADERS = ['Started', 'Run', 'Kind', 'State', 'Verdict'];

/** Every run of the pack, newest first. */
export function runRows(runs: readonly Run[], settings: LabSettings): string[][] {
  return runs.map((r) => [when(r.startedAt, settings.timeZone), r.name, r.kind, r.state, r.summary?.verdict ?? NO_VALUE]);
}
