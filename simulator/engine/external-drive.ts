/**
 * Instruments outside the scenario's program that drive the pack (the simulated electronic
 * load and supply, commanded over their own ports). During a `rest` step of the program the
 * bench asks the drive for current instead of resting.
 */
export interface ExternalDrive {
  /**
   * Terminal current the instruments demand from a source of `sourceVolts` behind `ohms`
   * (positive = discharge), or undefined when every output is off. Called often: no side effects.
   */
  demandAmps(sourceVolts: number, ohms: number): number | undefined;
  /** After each physics step: the terminal volts and the current that really flowed (the BMS may block it). */
  record(volts: number, amps: number, dtSeconds: number, t: number): void;
}
