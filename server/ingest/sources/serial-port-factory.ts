import type { EventEmitter } from 'node:events';
import { SerialPort } from 'serialport';

/** The part of serialport's stream a source uses; SerialPort and SerialPortMock both fit. */
export interface SerialPortLike extends EventEmitter {
  readonly isOpen: boolean;
  open(callback: (err: Error | null) => void): void;
  close(callback?: (err: Error | null) => void): void;
  write(data: Buffer | string): boolean;
}

/** The settings a serial source opens its port with. */
export interface PortOptions {
  path: string;
  baudRate: number;
  dataBits: 7 | 8;
  parity: 'none' | 'even' | 'odd';
  stopBits: 1 | 2;
}

/** Makes an unopened port; injected so unit tests use serialport's mock binding. */
export type PortFactory = (options: PortOptions) => SerialPortLike;

/** The real factory: a serialport 13 port that the source opens itself. */
export const openRealPort: PortFactory = (options) => new SerialPort({ ...options, autoOpen: false });
