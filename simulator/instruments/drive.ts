import type { ExternalDrive } from '../engine/external-drive.js';
import type { SimInstrument } from './sim-instrument.js';

/**
 * The simulated instruments as one drive of the bench: their demands add up; what really
 * flowed (the BMS may block it) is shared out in proportion to each one's demand.
 */
export function instrumentsDrive(instruments: readonly SimInstrument[]): ExternalDrive {
  let total = 0;
  return {
    demandAmps(sourceVolts, ohms) {
      let anyOn = false;
      total = 0;
      for (const instrument of instruments) {
        total += instrument.demandAmps(sourceVolts, ohms);
        anyOn ||= instrument.outputOn;
      }
      return anyOn ? total : undefined;
    },
    record(volts, amps, dtSeconds, t) {
      const share = total === 0 ? 0 : amps / total;
      for (const instrument of instruments) instrument.record(volts, share, dtSeconds, t);
    },
  };
}
