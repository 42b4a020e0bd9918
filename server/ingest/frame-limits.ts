import type { FrameLimits } from '../../shared/schemas/bench.js';
import { frameProblem } from '../../shared/schemas/frame-check.js';
import { HEATER_AMPS_CHANNEL, type Frame } from '../../shared/schemas/frame.js';

/**
 * Why a frame lies outside its bench's physical bounds, or null when it is inside. The
 * source counts such a frame as bad with this reason (shown where bad frames are counted)
 * and never hands it on, so no run integrates a value that cannot be a measurement.
 */
export function frameOutOfBounds(frame: Frame, limits: FrameLimits): string | null {
  if (Math.abs(frame.volts) > limits.maxAbsVolts) return `volts ${show(frame.volts)} beyond ±${limits.maxAbsVolts} V`;
  if (Math.abs(frame.amps) > limits.maxAbsAmps) return `amps ${show(frame.amps)} beyond ±${limits.maxAbsAmps} A`;
  const heaterAmps = frame.aux?.[HEATER_AMPS_CHANNEL];
  if (heaterAmps !== undefined && Math.abs(heaterAmps) > limits.maxAbsAmps) return `heater amps ${show(heaterAmps)} beyond ±${limits.maxAbsAmps} A`;
  for (const channel in frame.temps) {
    const celsius = frame.temps[channel]!;
    if (celsius < limits.minTempCelsius || celsius > limits.maxTempCelsius)
      return `temperature ${channel} ${show(celsius)} °C outside ${limits.minTempCelsius}…${limits.maxTempCelsius} °C`;
  }
  return null;
}

/**
 * Why a source must not hand a frame on: not a valid Frame (the FrameSchema rules, checked by
 * hand) or outside its bench's physical bounds; null when it may go. Every source checks each
 * frame here once, where it is made, so the bench view, the run and the archive all see
 * checked frames and nothing downstream checks again.
 */
export function frameRejection(frame: Frame, limits: FrameLimits): string | null {
  const problem = frameProblem(frame);
  return problem === null ? frameOutOfBounds(frame, limits) : `bad frame: ${problem}`;
}

const SHOWN_DIGITS = 6;

/** A value as a person reads it in a status line: short, exponent for the absurd ones. */
function show(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(SHOWN_DIGITS))) : String(x);
}
