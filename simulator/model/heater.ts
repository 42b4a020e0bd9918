/** Heater settings: a thermostat with hysteresis, powered from the charger. */
export interface HeaterParams {
  watts: number;
  /** Pack volts at which the element draws its rated watts (it is a plain resistor). */
  ratedVolts: number;
  onBelowCelsius: number;
  offAboveCelsius: number;
  /** Pulse-width modulation while on (absent: powered all the time it is on). */
  pwm?: { onSeconds: number; offSeconds: number };
}

/** Thermostat state: switches on below one threshold and off above another. */
export interface HeaterController {
  readonly on: boolean;
  /** Updates the thermostat at simulated time tS; returns 'on' or 'off' when it switches, else undefined. */
  update(tempCelsius: number, tS?: number): 'on' | 'off' | undefined;
  /** Current the element draws at a supply voltage at simulated time tS (0 when off or in a PWM off slot). */
  amps(supplyVolts: number, tS?: number): number;
}

/** Float steps (0.25 s ...) add up: a tolerance keeps a slot boundary where it belongs. */
const PWM_EPSILON_S = 1e-9;

/** Creates the heater thermostat; it starts off. */
export function createHeater(params: HeaterParams): HeaterController {
  const elementOhms = (params.ratedVolts * params.ratedVolts) / params.watts;
  let on = false;
  let onAtSeconds = 0;
  const powered = (tS: number): boolean => {
    if (!params.pwm) return true;
    const period = params.pwm.onSeconds + params.pwm.offSeconds;
    const phase = (tS - onAtSeconds + PWM_EPSILON_S) % period;
    return phase < params.pwm.onSeconds;
  };
  return {
    get on() {
      return on;
    },
    update(tempCelsius, tS = 0) {
      if (!on && tempCelsius < params.onBelowCelsius) {
        on = true;
        onAtSeconds = tS;
        return 'on';
      }
      if (on && tempCelsius > params.offAboveCelsius) {
        on = false;
        return 'off';
      }
      return undefined;
    },
    amps: (supplyVolts, tS = 0) => (on && powered(tS) ? Math.max(0, supplyVolts) / elementOhms : 0),
  };
}
