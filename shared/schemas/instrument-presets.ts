import type { z } from 'zod';
import type { InstrumentRegisterMapSchema, ScpiCommandSetSchema } from './instrument-driver.js';

/**
 * Command sets and register maps of the simulator's electronic load and supply, which follow
 * common SCPI practice (SCPI-1999 style headers: FUNCtion, CURRent, INPut, OUTPut; the
 * watchdog header is our own, SCPI has none). A real instrument's manual gives its own words.
 */

/** The simulated electronic load's SCPI words. */
export const SIM_LOAD_SCPI: z.input<typeof ScpiCommandSetSchema> = {
  mode: { cc: 'FUNC CURR', cp: 'FUNC POW', cr: 'FUNC RES', cv: 'FUNC VOLT' },
  setValue: { cc: 'CURR {value}', cp: 'POW {value}', cr: 'RES {value}', cv: 'VOLT {value}' },
  outputOn: 'INP ON',
  outputOff: 'INP OFF',
  readOutput: 'INP?',
  watchdog: 'SYST:WDOG {value}',
};

/** The simulated supply's (charger's) SCPI words: CV with a current limit, or CC. */
export const SIM_SUPPLY_SCPI: z.input<typeof ScpiCommandSetSchema> = {
  mode: { cc: 'FUNC CURR', cv: 'FUNC VOLT' },
  setValue: { cc: 'CURR {value}', cv: 'VOLT {value}' },
  currentLimit: 'CURR {value}',
  outputOn: 'OUTP ON',
  outputOff: 'OUTP OFF',
  readOutput: 'OUTP?',
  watchdog: 'SYST:WDOG {value}',
};

/** Milli-units in 32-bit registers: 0.001 A, W, Ω or V a count. */
const MILLI = 0.001;
const milli = (address: number) => ({ address, type: 'u32' as const, scale: MILLI });

/** Holding registers of the simulated load and supply (the same map for both). */
export const SIM_INSTRUMENT_REGISTERS: z.input<typeof InstrumentRegisterMapSchema> = {
  mode: { address: 0, type: 'u16', codes: { cc: 0, cp: 1, cr: 2, cv: 3 } },
  setValue: { cc: milli(2), cp: milli(4), cr: milli(6), cv: milli(8) },
  currentLimit: milli(10),
  output: { address: 12, type: 'u16' },
  watchdog: { address: 13, type: 'u16' },
  errorCode: { address: 14, type: 'u16' },
  reset: { address: 15, value: 1 },
  volts: { address: 16, type: 'i32', scale: MILLI },
  amps: { address: 18, type: 'i32', scale: MILLI },
  identity: { address: 32, count: 24 },
};
