import { SerialPort } from 'serialport';
import { openPtyPair, type PtyPair } from '../transport/socat.js';

const DEVICE_BAUD = 115200;

/** Answers bytes received on the instrument's port with the bytes to send back. */
export type InstrumentResponder = (received: Buffer) => (string | Uint8Array)[];

/** A simulated instrument's end of a socat pseudo-terminal pair. */
export interface PtyInstrumentPort {
  /** Where the server opens the instrument (outside the repository). */
  readonly path: string;
  /** Stops socat: the link vanishes, as when the instrument's cable is pulled. */
  close(): Promise<void>;
}

/** Opens a pseudo-terminal at linkPath and answers what arrives there through `respond`. */
export async function openPtyInstrumentPort(linkPath: string, respond: InstrumentResponder): Promise<PtyInstrumentPort> {
  const pair: PtyPair = await openPtyPair(linkPath);
  const port = new SerialPort({ path: pair.devicePath, baudRate: DEVICE_BAUD, autoOpen: false });
  try {
    await new Promise<void>((ok, fail) => port.open((error) => (error ? fail(error) : ok())));
  } catch (error) {
    await pair.close();
    throw error;
  }
  // The far end vanishing surfaces as EIO; the instrument just goes quiet.
  port.on('error', () => undefined);
  port.on('data', (bytes: Buffer) => {
    for (const reply of respond(bytes)) if (port.isOpen) port.write(typeof reply === 'string' ? Buffer.from(reply, 'latin1') : Buffer.from(reply));
  });
  return {
    path: linkPath,
    async close() {
      await pair.close();
      if (port.isOpen) await new Promise<void>((done) => port.close(() => done()));
    },
  };
}
