import { InstrumentDriverSchema, type InstrumentDriverInput } from '../../shared/schemas/instrument-driver.js';
import { systemClock, type Clock } from '../ingest/clock.js';
import { openRealPort, type PortFactory, type SerialPortLike } from '../ingest/sources/serial-port-factory.js';
import { InstrumentFault, type InstrumentControl } from './instrument-control.js';
import { ModbusInstrument } from './modbus-instrument.js';
import { ScpiInstrument } from './scpi-instrument.js';

/** What opening an instrument needs from outside; tests pass a manual clock and the mock binding. */
export interface InstrumentDeps {
  clock?: Clock;
  openPort?: PortFactory;
}

/** Opens a port; a failure is an InstrumentFault naming the port. */
export async function openPort(id: string, port: SerialPortLike, path: string): Promise<void> {
  await new Promise<void>((resolve, reject) =>
    port.open((err) => (err ? reject(new InstrumentFault(id, `cannot open ${path}: ${err.message}`)) : resolve())),
  );
}

/** Validates an instrument's driver settings, opens its port and returns its control. */
export async function openInstrument(input: InstrumentDriverInput, deps: InstrumentDeps = {}): Promise<InstrumentControl> {
  const config = InstrumentDriverSchema.parse(input);
  const clock = deps.clock ?? systemClock;
  const port = (deps.openPort ?? openRealPort)(config.port);
  await openPort(config.id, port, config.port.path);
  // A port error after opening reaches the driver's pending exchange; this keeps it from being unhandled.
  port.on('error', () => undefined);
  if (config.protocol === 'scpi') return new ScpiInstrument(config, port, clock);
  const instrument = new ModbusInstrument(config, port, clock);
  await instrument.start();
  return instrument;
}
