import type { MeasureConfig, TempProtection } from '../schemas/measure-config.js';
import type { ProtectionExpectation } from '../schemas/protection-check.js';

/** Share of the end voltage used as the default hysteresis band. */
const DEFAULT_HYSTERESIS_SHARE = 0.01;
/** Share of the end voltage above it where the early warning fires by default. */
const DEFAULT_WARN_SHARE = 0.05;
/** Hysteresis when no end voltage is known, V. */
const FALLBACK_HYSTERESIS_VOLTS = 0.05;
/** Recovery threshold above the collapse voltage when no end voltage is known, V. */
const FALLBACK_RECOVERY_MARGIN_VOLTS = 1;
const HALF = 0.5;

/** Thresholds the detector works with, all resolved to absolute numbers once per run. */
export interface DetectorSettings {
  endVolts: number | null;
  warnVolts: number | null;
  hysteresisVolts: number;
  recoveryVolts: number;
  collapseVolts: number;
  zeroAmps: number;
  loadOnAmps: number;
  confirmReadings: number;
  ratedAh: number | null;
  ratedWh: number | null;
  tempProtections: TempProtection[];
  protectionChecks: ProtectionExpectation[];
  tempHysteresisCelsius: number;
  heaterOnAmps: number;
  heaterOffAmps: number;
  heaterPwmOffSeconds: number;
  heaterTempChannel: string | null;
}

/** The run's end voltage: absolute if given, else per cell × cells in series, else null. */
export function resolveEndVolts(config: Pick<MeasureConfig, 'endVolts' | 'endVoltsPerCell' | 'cellsInSeries'>): number | null {
  if (config.endVolts !== undefined) return config.endVolts;
  if (config.endVoltsPerCell !== undefined && config.cellsInSeries !== undefined) return config.endVoltsPerCell * config.cellsInSeries;
  return null;
}

/** Resolves a parsed MeasureConfig into the detector's absolute thresholds. */
export function resolveDetectorSettings(config: MeasureConfig): DetectorSettings {
  const endVolts = resolveEndVolts(config);
  const hysteresisVolts = config.hysteresisVolts ?? (endVolts === null ? FALLBACK_HYSTERESIS_VOLTS : endVolts * DEFAULT_HYSTERESIS_SHARE);
  const warnMargin = config.warnMarginVolts ?? (endVolts === null ? 0 : endVolts * DEFAULT_WARN_SHARE);
  return {
    endVolts,
    warnVolts: endVolts === null ? null : endVolts + warnMargin,
    hysteresisVolts,
    recoveryVolts: config.recoveryVolts ?? endVolts ?? config.collapseVolts + FALLBACK_RECOVERY_MARGIN_VOLTS,
    collapseVolts: config.collapseVolts,
    zeroAmps: config.zeroAmps,
    loadOnAmps: Math.max(config.loadOnAmps, config.zeroAmps),
    confirmReadings: config.confirmReadings,
    ratedAh: config.ratedAh ?? null,
    ratedWh: config.ratedWh ?? null,
    tempProtections: config.tempProtections,
    protectionChecks: config.protectionChecks,
    tempHysteresisCelsius: config.tempHysteresisCelsius,
    heaterOnAmps: config.heaterOnAmps,
    heaterOffAmps: Math.min(config.heaterOffAmps, config.heaterOnAmps),
    heaterPwmOffSeconds: config.heaterPwmOffSeconds,
    heaterTempChannel: config.heaterTempChannel ?? null,
  };
}

/** Fraction of rated capacity at which the half-way milestone fires. */
export const HALF_RATED = HALF;
