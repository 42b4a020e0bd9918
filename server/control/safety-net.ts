import type { ProgrammeReading } from './step-conditions.js';

/**
 * The server's own limits, checked on every reading and every tick whatever the step says.
 * They are a second line behind the pack's protection, not a replacement for it.
 */
export interface SafetyLimits {
  /** A discharge stops at or below this, pack volts (chemistry floor, or protection cutoff plus margin). */
  floorVolts: number;
  /** A charge stops above this, pack volts. */
  ceilingVolts: number;
  /** Every output goes off when any temperature channel reaches this, °C. */
  overTempCelsius: number;
  /** Outputs go off when the meter has said nothing for this long, ms. */
  meterSilentMs: number;
}

/**
 * Outputs go off when no reading came for this long. With the executor's 250 ms tick the load
 * is off within 2 s of the last reading, as bench practice asks of an unattended test.
 */
export const METER_SILENT_MS = 1500;
/**
 * Default over-temperature limit, °C: makers' data sheets of lithium cells typically put the top
 * of the discharge range at 60 °C (from memory); a run's own high-temperature alarm, when lower, wins.
 */
export const DEFAULT_OVER_TEMP_CELSIUS = 60;
/** A charge may overshoot its ceiling by this share before the server calls it unsafe (the supply's regulation and the meter's error). */
export const CEILING_OVERSHOOT_SHARE = 0.01;

/** Which outputs are on now. */
export interface OutputsOn {
  load: boolean;
  supply: boolean;
}

/** Why this reading must switch every output off, or null. Pure. */
export function readingTrip(r: ProgrammeReading, on: OutputsOn, limits: SafetyLimits): string | null {
  if (on.load && r.volts <= limits.floorVolts) return `pack at ${r.volts.toFixed(3)} V, at or below the safety floor of ${limits.floorVolts.toFixed(3)} V`;
  if (on.supply && r.volts > limits.ceilingVolts * (1 + CEILING_OVERSHOOT_SHARE)) return `pack at ${r.volts.toFixed(3)} V, above the charge ceiling of ${limits.ceilingVolts.toFixed(3)} V`;
  const hot = Object.entries(r.temps ?? {}).find(([, c]) => c >= limits.overTempCelsius);
  if (hot) return `temperature ${hot[0]} at ${hot[1].toFixed(1)} °C, at or above the limit of ${limits.overTempCelsius} °C`;
  return null;
}

/** Why the meter's silence must switch every output off, or null. Pure. */
export function silenceTrip(lastReadingAtMs: number, nowMs: number, limits: SafetyLimits): string | null {
  const silentMs = nowMs - lastReadingAtMs;
  return silentMs >= limits.meterSilentMs ? `meter silent for ${(silentMs / 1000).toFixed(1)} s` : null;
}
