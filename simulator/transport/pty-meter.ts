import { SerialPort } from 'serialport';
import { createSimulation, type SimReading, type SimulationOptions } from '../engine/simulation.js';
import { createMeterDevice, csvOptionsFor, type MeterDeviceOptions, type MeterFormat } from '../meter/device.js';
import type { Scenario, ScenarioInput } from '../scenario/schema.js';
import { openPtyPair, type PtyPair } from './socat.js';

/** Bytes queued towards a port nobody reads before the meter stops queueing (a real meter just sends). */
const MAX_PENDING_BYTES = 4096;
const DEVICE_BAUD = 115200;

export interface PtyMeterOptions extends SimulationOptions {
  scenario: Scenario | ScenarioInput;
  format: MeterFormat;
  /** Where the gateway opens the meter, outside the repository (e.g. /tmp/kneepoint-meter-1). */
  linkPath: string;
  /** Play in real time at `speed` (default); false leaves stepping to tick(). */
  autoplay?: boolean;
  csv?: MeterDeviceOptions['csv'];
  scpi?: MeterDeviceOptions['scpi'];
  modbus?: MeterDeviceOptions['modbus'];
}

/** A simulated meter on a pseudo-terminal. */
export interface PtyMeter {
  readonly path: string;
  readonly plugged: boolean;
  readonly simulation: ReturnType<typeof createSimulation>;
  /** Resolves when the scenario's program has ended (autoplay) or the meter stopped. */
  readonly finished: Promise<void>;
  /** Advances one reading by hand and sends it (with autoplay off); undefined at the end. */
  tick(): Promise<SimReading | undefined>;
  /** Pulls the cable: socat stops, the link disappears, the gateway's port closes. */
  unplug(): Promise<void>;
  /** Plugs it back: a new pseudo-terminal at the same link path. */
  replug(): Promise<void>;
  stop(): Promise<void>;
}

/** Starts a scenario as a meter on a socat pseudo-terminal that the gateway opens with serialport. */
export async function startPtyMeter(options: PtyMeterOptions): Promise<PtyMeter> {
  const simulation = createSimulation(options.scenario, options);
  const csv = options.csv ?? csvOptionsFor(simulation.scenario);
  const device = createMeterDevice({ ...options, csv, meter: simulation.meter, seed: simulation.seed });
  let pair: PtyPair | undefined;
  let port: SerialPort | undefined;
  let stopped = false;
  /** Set by unplug(): the cable stays out until replug(), whatever the scenario says. */
  let heldOut = false;
  let markStopped: () => void = () => undefined;
  const stoppedPromise = new Promise<void>((done) => (markStopped = done));
  let queue: Promise<void> = Promise.resolve();
  const serial = (job: () => Promise<void>): Promise<void> => (queue = queue.then(job, job));

  const write = (chunks: Uint8Array[]): void => {
    for (const chunk of chunks) {
      if (!port?.isOpen || port.writableLength > MAX_PENDING_BYTES) return;
      port.write(Buffer.from(chunk));
    }
  };
  const plugIn = async (): Promise<void> => {
    const opening = await openPtyPair(options.linkPath);
    pair = opening;
    // socat dying on its own (killed from outside) is an unplug; the next reading plugs back in.
    opening.process.once('exit', () => {
      if (pair !== opening) return;
      const orphan = port;
      pair = undefined;
      port = undefined;
      if (orphan?.isOpen) orphan.close();
    });
    const opened = new SerialPort({ path: opening.devicePath, baudRate: DEVICE_BAUD, autoOpen: false });
    await new Promise<void>((ok, fail) => opened.open((error) => (error ? fail(error) : ok())));
    // The far end vanishing (unplug, stop) surfaces here as EIO; the meter just goes quiet.
    opened.on('error', () => undefined);
    opened.on('data', (bytes: Buffer) => write(device.receive(bytes)));
    port = opened;
  };
  const pullOut = async (): Promise<void> => {
    const closing = port;
    port = undefined;
    await pair?.close();
    pair = undefined;
    if (closing?.isOpen) await new Promise<void>((done) => closing.close(() => done()));
  };
  const deliver = (reading: SimReading): void => {
    if (!reading.plugged && port) void serial(pullOut);
    if (reading.plugged && !port && !stopped && !heldOut) void serial(plugIn);
    void serial(async () => write(device.sample(reading)));
  };

  await serial(plugIn);
  const player = options.autoplay === false ? undefined : simulation.play(deliver);
  const finished = Promise.race([player ? player.finished : stoppedPromise, stoppedPromise]);
  return {
    path: options.linkPath,
    simulation,
    finished,
    get plugged() {
      return port !== undefined;
    },
    async tick() {
      const reading = simulation.step();
      if (reading) deliver(reading);
      // By hand, a reading counts as sent once its bytes have left for the pseudo-terminal.
      await serial(() => new Promise<void>((done) => (port?.isOpen ? port.drain(() => done()) : done())));
      return reading;
    },
    unplug() {
      heldOut = true;
      return serial(pullOut);
    },
    replug() {
      heldOut = false;
      return serial(async () => (port || stopped ? undefined : plugIn()));
    },
    async stop() {
      stopped = true;
      player?.stop();
      await serial(pullOut);
      markStopped();
    },
  };
}
