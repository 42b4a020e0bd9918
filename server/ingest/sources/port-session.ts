import type { Frame } from '../../../shared/schemas/frame.js';
import type { Clock } from '../clock.js';
import type { StatusTracker } from '../status-tracker.js';
import type { SerialPortLike } from './serial-port-factory.js';

/** What a protocol session gets from the serial source for the life of one open port. */
export interface SessionContext {
  port: SerialPortLike;
  clock: Clock;
  tracker: StatusTracker;
  /** Delivers a valid frame (the source counts it and feeds the watchdog). */
  emitFrame(frame: Frame): void;
}

/** One protocol spoken over an open port (lines, SCPI polling, Modbus polling). */
export interface PortSession {
  /** Stops timers and listeners; the serial source closes the port itself. */
  stop(): void;
}
