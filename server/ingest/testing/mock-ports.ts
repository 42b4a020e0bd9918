import { SerialPortMock } from 'serialport';
import type { PortFactory, SerialPortLike } from '../sources/serial-port-factory.js';

/** serialport's mock binding: go through SerialPortMock.binding (importing MockBinding loads a second copy whose ports are not found). */
export const mockBinding = SerialPortMock.binding;

/** A port factory over the mock binding that remembers every port it made. */
export function mockPortFactory(): { factory: PortFactory; ports: SerialPortMock[] } {
  const ports: SerialPortMock[] = [];
  const factory: PortFactory = (options) => {
    const port = new SerialPortMock({ ...options, autoOpen: false });
    ports.push(port);
    return port as unknown as SerialPortLike;
  };
  return { factory, ports };
}

/** Lets the mock binding's promise-based open/read/write settle (no timers involved). */
export async function settle(rounds = 10): Promise<void> {
  for (let i = 0; i < rounds; i++) await new Promise((resolve) => setImmediate(resolve));
}
