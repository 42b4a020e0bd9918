import type { Frame } from '../../shared/schemas/frame.js';
import { HEATER_AMPS_CHANNEL } from '../../shared/schemas/frame.js';
import type { Prng } from '../prng.js';
import type { MeterConfig } from '../scenario/schema.js';

/** The true values a meter looks at, before noise and rounding. */
export interface TrueReading {
  t: number;
  volts: number;
  amps: number;
  cellTempCelsius: number;
  ambientCelsius: number;
  /** Present only on packs with a heater pad. */
  heaterAmps?: number;
}

/** Rounds to a resolution step; the toFixed keeps 12.345 from printing as 12.345000000001. */
export function quantise(value: number, step: number): number {
  if (step <= 0) return value;
  const decimals = Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
  return Number((Math.round(value / step) * step).toFixed(decimals));
}

/**
 * What the meter reports for one true reading: Gaussian noise, then quantisation.
 * Every call draws the same number of random values so that the stream stays aligned
 * (the same seed gives the same bytes whatever the values were).
 */
export function measure(truth: TrueReading, seq: number, config: MeterConfig, prng: Prng): Frame {
  const noisy = (value: number, sigma: number, step: number): number => {
    const deviate = prng.gaussian();
    return quantise(value + sigma * deviate, step);
  };
  const volts = noisy(truth.volts, config.voltsNoise, config.voltsStep);
  const amps = noisy(truth.amps, config.ampsNoise, config.ampsStep);
  const cell = noisy(truth.cellTempCelsius, config.tempNoise, config.tempStep) + 0;
  const ambient = noisy(truth.ambientCelsius, config.tempNoise, config.tempStep) + 0;
  const heater = noisy(truth.heaterAmps ?? 0, config.ampsNoise, config.ampsStep);
  // Rounding a small negative value leaves -0; JSON writes it as 0, so +0 makes a frame equal
  // to its own round trip through the wire.
  const frame: Frame = {
    t: truth.t,
    volts: volts + 0,
    amps: amps + 0,
    temps: { cell, ambient },
    clock: 'device',
    seq,
  };
  if (truth.heaterAmps !== undefined) frame.aux = { [HEATER_AMPS_CHANNEL]: Math.max(0, heater) + 0 };
  return frame;
}

/** Whether the meter's cable is plugged in at simulated time tS. */
export function isPlugged(config: MeterConfig, tS: number): boolean {
  return !config.unplugs.some((u) => tS >= u.atSeconds && tS < u.atSeconds + u.forSeconds);
}
