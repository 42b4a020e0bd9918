import { SerialPortMock } from 'serialport';
import type { PortFactory, SerialPortLike } from '../sources/serial-port-factory.js';

/** A fake instrument: given what the source wrote, returns the bytes to answer (or nothing). */
export type Instrument = (written: Buffer) => Buffer | string | (Buffer | string)[] | undefined;

/**
 * A mock-binding port factory whose ports answer every write through `instrument`, as a
 * polled meter would. Answers (or their pieces) arrive on later turns of the event loop.
 */
export function respondingPortFactory(instrument: Instrument, made: SerialPortMock[] = []): PortFactory {
  return (options) => {
    const port = new SerialPortMock({ ...options, autoOpen: false });
    made.push(port);
    const write = port.write.bind(port) as (data: Buffer | string) => boolean;
    (port as unknown as { write: (data: Buffer | string) => boolean }).write = (data) => {
      const ok = write(data);
      const answer = instrument(Buffer.isBuffer(data) ? data : Buffer.from(data));
      // Each piece arrives on its own turn of the event loop, as chunks off a serial line do.
      const pieces = answer === undefined ? [] : Array.isArray(answer) ? answer : [answer];
      let at = Promise.resolve();
      for (const piece of pieces) at = at.then(() => new Promise((r) => setImmediate(() => r(port.port?.emitData(piece)))));
      return ok;
    };
    return port as unknown as SerialPortLike;
  };
}
