import type { MeasureConfig, TempProtection } from '../schemas/measure-config.js';
import { resolveGapLimit } from './gap-limit.js';

/** Share of the end voltage used as the default hysteresis band. */
const DEFAULT_HYSTERESIS_SHARE = 0.01;
/** Share of the end voltage above it where the early warning fires by default. */
const DEFAULT_WARN_SHARE = 0.05;
/** Hysteresis when no end voltage is known, V. */
const FALLBACK_HYSTERESIS_VOLTS = 0.05;
/** Recovery threshold above the collapse voltage when no end voltage is known, V. */
const FALLBACK_RECOVERY_MARGIN_VOLTS = 1;
const HALF = 0.5;
/**
 * A collapse (protection open) is at most this share of the end voltage, so a low end voltage
 * (1.0 V for a 1-cell NiMH pack) is never itself read as a collapse.
 */
const COLLAPSE_SHARE_OF_END = 0.5;
/** Load threshold when the bench sets none, A (the figure used before it could be set). */
export const DEFAULT_LOAD_ON_AMPS = 0.2;
/**
 * …but never above this share of the 1 C current of the rated capacity (C/20, a quarter of
 * the 0.2 C test rate), so a small pack's rated-rate test is seen as a load.
 */
const LOAD_ON_SHARE_OF_1C = 0.05;

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
  tempHysteresisCelsius: number;
  heaterOnAmps: number;
  heaterOffAmps: number;
  heaterTempChannel: string | null;
  /** The gap limit in force, s (a step longer than this is not integrated). */
  gapSeconds: number;
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
  const collapseVolts = endVolts === null ? config.collapseVolts : Math.min(config.collapseVolts, endVolts * COLLAPSE_SHARE_OF_END);
  return {
    endVolts,
    warnVolts: endVolts === null ? null : endVolts + warnMargin,
    hysteresisVolts,
    recoveryVolts: config.recoveryVolts ?? endVolts ?? collapseVolts + FALLBACK_RECOVERY_MARGIN_VOLTS,
    collapseVolts,
    zeroAmps: config.zeroAmps,
    loadOnAmps: Math.max(resolveLoadOnAmps(config), config.zeroAmps),
    confirmReadings: config.confirmReadings,
    ratedAh: config.ratedAh ?? null,
    ratedWh: config.ratedWh ?? null,
    tempProtections: config.tempProtections,
    tempHysteresisCelsius: config.tempHysteresisCelsius,
    heaterOnAmps: config.heaterOnAmps,
    heaterOffAmps: Math.min(config.heaterOffAmps, config.heaterOnAmps),
    heaterTempChannel: config.heaterTempChannel ?? null,
    gapSeconds: resolveGapLimit(config).seconds,
  };
}

/** The load threshold: as set (per bench), else 0.2 A, lowered to C/20 of the rated capacity for a small pack. */
export function resolveLoadOnAmps(config: Pick<MeasureConfig, 'loadOnAmps' | 'ratedAh'>): number {
  if (config.loadOnAmps !== undefined) return config.loadOnAmps;
  return config.ratedAh === undefined ? DEFAULT_LOAD_ON_AMPS : Math.min(DEFAULT_LOAD_ON_AMPS, config.ratedAh * LOAD_ON_SHARE_OF_1C);
}

/** Fraction of rated capacity at which the half-way milestone fires. */
export const HALF_RATED = HALF;
