/**
 * The contract between a test programme and the instruments it drives (an electronic load, a
 * power supply or charger). Drivers (SCPI over serial, Modbus RTU) implement it; the programme
 * executor and the safety net use only this. Every call resolves or rejects within the
 * driver's reply timeout: an instrument that answers garbage or nothing rejects with
 * {@link InstrumentFault}, and the caller fails safe (outputs off).
 */

/** What the instrument is: sinks current (load) or sources it (supply, charger). */
export type InstrumentRole = 'load' | 'supply';

/** Regulation mode: constant current, constant power, constant resistance, constant voltage. */
export type ControlMode = 'cc' | 'cp' | 'cr' | 'cv';

/** A set point in the unit of its mode: amps (cc), watts (cp), ohms (cr), volts (cv). */
export interface SetPoint {
  mode: ControlMode;
  value: number;
  /** For a supply in CV: the current limit in amps (CC-CV charging). */
  currentLimitAmps?: number;
}

/** What the instrument reads back at its terminals. */
export interface ReadBack {
  volts: number;
  amps: number;
  outputOn: boolean;
}

/** One command sent and the reply got (or none), for the run's command log. */
export interface CommandLogEntry {
  atMs: number;
  instrumentId: string;
  sent: string;
  reply: string | null;
  /** Why the exchange failed (timeout, garbage, instrument error queue), null when it did not. */
  problem: string | null;
}

/** An instrument did not answer, answered garbage, or reported an error. */
export class InstrumentFault extends Error {
  constructor(readonly instrumentId: string, readonly reason: string) {
    super(`${instrumentId}: ${reason}`);
    this.name = 'InstrumentFault';
  }
}

/** One controllable instrument, as a programme sees it. */
export interface InstrumentControl {
  readonly id: string;
  readonly role: InstrumentRole;
  /** `*IDN?` or its register equivalent: make, model, serial, firmware as one line. */
  identify(): Promise<string>;
  /** Back to a known state with the output off (`*RST`, then output off). */
  reset(): Promise<void>;
  /** Select the mode and set the value (and the current limit in CV). */
  set(point: SetPoint): Promise<void>;
  /** Switch the input (load) or output (supply) on or off. */
  setOutput(on: boolean): Promise<void>;
  /** Read back volts, amps and output state. */
  read(): Promise<ReadBack>;
  /** Drain the instrument's error queue (`SYST:ERR?` until "0,..."); empty when none. */
  errors(): Promise<string[]>;
  /**
   * Arm the instrument-side watchdog where supported: it switches the output off by itself if
   * no command arrives for `timeoutSeconds`. Resolves false when the instrument has none.
   */
  armWatchdog(timeoutSeconds: number): Promise<boolean>;
  /** Close the port; does not switch anything. */
  close(): Promise<void>;
  /** Register a listener for every command exchange (for the command log); returns an unsubscribe. */
  onCommand(listener: (entry: CommandLogEntry) => void): () => void;
}
