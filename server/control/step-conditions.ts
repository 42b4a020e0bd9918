import type { Reading } from '../../shared/schemas/reading.js';
import type { SimpleStep } from '../../shared/schemas/programme.js';
import type { StepEndCause } from '../../shared/schemas/programme-run.js';
import { SECONDS_PER_MINUTE } from '../../shared/units/time.js';

/** What the executor needs of a reading: volts, amps, temperatures and the run's running totals. */
export type ProgrammeReading = Pick<Reading, 'elapsedSeconds' | 'volts' | 'amps' | 'temps' | 'chargeAh' | 'chargeWh' | 'dischargeAh' | 'dischargeWh'>;

/**
 * A charge is in its constant-voltage phase once the pack is within this share of the set
 * voltage (a supply regulates to well under 1 %; the leads drop a little more).
 */
export const CV_REACHED_SHARE = 0.02;
/** The taper is judged only after the charge has run this long (the current needs a moment to rise). */
export const TAPER_SETTLE_SECONDS = 10;
/** A rest's settle test looks at the voltage change over this window, s. */
export const SETTLE_WINDOW_SECONDS = 60;

/** Everything a step's end test looks at. */
export interface StepProgress {
  step: SimpleStep;
  /** Time in the step on the server clock, paused time left out, s. */
  stepSeconds: number;
  /** The reading the step started from (its totals are the zero of the step's figures). */
  start: ProgrammeReading;
  latest: ProgrammeReading;
  /** The pack volts one settle window ago (null until the step has run that long on the meter's clock). */
  voltsWindowAgo: number | null;
}

/** The step's figures so far: totals now less totals at its start. */
export function stepTotals(start: ProgrammeReading, latest: ProgrammeReading) {
  return {
    chargeAh: Math.max(0, latest.chargeAh - start.chargeAh),
    chargeWh: Math.max(0, latest.chargeWh - start.chargeWh),
    dischargeAh: Math.max(0, latest.dischargeAh - start.dischargeAh),
    dischargeWh: Math.max(0, latest.dischargeWh - start.dischargeWh),
  };
}

function tempsOf(r: ProgrammeReading): number[] {
  return r.temps ? Object.values(r.temps) : [];
}

/** How a step ended: the cause and the words for people. */
export interface StepEnd {
  cause: StepEndCause;
  reason: string;
}

const end = (cause: StepEndCause, reason: string): StepEnd => ({ cause, reason });

/** Why the step is over, or null while it goes on. Pure. */
export function stepEndReason(p: StepProgress): StepEnd | null {
  const { step, latest } = p;
  switch (step.kind) {
    case 'charge': {
      const chargeAmps = -latest.amps;
      const inCv = latest.volts >= step.volts * (1 - CV_REACHED_SHARE);
      if (step.taperAmps !== undefined && inCv && p.stepSeconds >= TAPER_SETTLE_SECONDS && chargeAmps <= step.taperAmps)
        return end('taper', `taper current reached (${chargeAmps.toFixed(3)} A at ${latest.volts.toFixed(3)} V)`);
      if (step.maxSeconds !== undefined && p.stepSeconds >= step.maxSeconds) return end('time', `time reached (${step.maxSeconds} s)`);
      return null;
    }
    case 'rest': {
      if (step.settleVoltsPerMinute !== undefined && p.voltsWindowAgo !== null) {
        const perMinute = (Math.abs(latest.volts - p.voltsWindowAgo) / SETTLE_WINDOW_SECONDS) * SECONDS_PER_MINUTE;
        if (perMinute <= step.settleVoltsPerMinute) return end('settled', `voltage settled (${perMinute.toFixed(4)} V/min)`);
      }
      if (step.maxSeconds !== undefined && p.stepSeconds >= step.maxSeconds) return end('time', `time reached (${step.maxSeconds} s)`);
      return null;
    }
    case 'discharge': {
      if (latest.volts <= step.endVolts) return end('end-voltage', `end voltage reached (${latest.volts.toFixed(3)} V)`);
      const done = stepTotals(p.start, latest);
      if (step.targetAh !== undefined && done.dischargeAh >= step.targetAh) return end('target', `target reached (${done.dischargeAh.toFixed(3)} Ah)`);
      if (step.targetWh !== undefined && done.dischargeWh >= step.targetWh) return end('target', `target reached (${done.dischargeWh.toFixed(3)} Wh)`);
      return null;
    }
    case 'wait-temp': {
      const temps = tempsOf(latest);
      if (temps.length === 0) return null;
      const reached = step.direction === 'below' ? Math.max(...temps) <= step.targetCelsius : Math.min(...temps) >= step.targetCelsius;
      return reached ? end('temperature', `temperature reached (${step.targetCelsius} °C)`) : null;
    }
  }
}

/** A step that ran out of time without reaching what it waits for fails (a wait for temperature); null otherwise. */
export function stepTimeoutFault(p: StepProgress): string | null {
  if (p.step.kind !== 'wait-temp' || p.stepSeconds < p.step.maxSeconds) return null;
  return tempsOf(p.latest).length === 0
    ? 'no temperature reading on this bench to wait for'
    : `temperature not ${p.step.direction} ${p.step.targetCelsius} °C after ${p.step.maxSeconds} s`;
}
