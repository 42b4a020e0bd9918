/** Heater pad settings: a thermostat with hysteresis, powered from the charger. */
export interface HeaterParams {
  watts: number;
  /** Pack volts at which the pad draws its rated watts (it is a plain resistor). */
  ratedVolts: number;
  onBelowC: number;
  offAboveC: number;
}

/** Thermostat state: switches on below one threshold and off above another. */
export interface HeaterController {
  readonly on: boolean;
  /** Updates the thermostat; returns 'on' or 'off' when it switches, else undefined. */
  update(tempC: number): 'on' | 'off' | undefined;
  /** Current the pad draws at a supply voltage (0 when off). */
  amps(supplyVolts: number): number;
}

/** Creates the heater thermostat; it starts off. */
export function createHeater(params: HeaterParams): HeaterController {
  const padOhms = (params.ratedVolts * params.ratedVolts) / params.watts;
  let on = false;
  return {
    get on() {
      return on;
    },
    update(tempC) {
      if (!on && tempC < params.onBelowC) {
        on = true;
        return 'on';
      }
      if (on && tempC > params.offAboveC) {
        on = false;
        return 'off';
      }
      return undefined;
    },
    amps: (supplyVolts) => (on ? Math.max(0, supplyVolts) / padOhms : 0),
  };
}
