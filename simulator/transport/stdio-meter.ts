import type { Readable, Writable } from 'node:stream';
import { createSimulation, type SimulationOptions } from '../engine/simulation.js';
import { createMeterDevice, csvOptionsFor, type MeterDeviceOptions, type MeterFormat } from '../meter/device.js';
import type { Scenario, ScenarioInput } from '../scenario/schema.js';

export interface StreamMeterOptions extends SimulationOptions {
  scenario: Scenario | ScenarioInput;
  format: MeterFormat;
  output: Writable;
  /** Where queries come from for SCPI and Modbus (stdin for the CLI). */
  input?: Readable;
  csv?: MeterDeviceOptions['csv'];
  scpi?: MeterDeviceOptions['scpi'];
  modbus?: MeterDeviceOptions['modbus'];
}

/**
 * Plays a scenario as a meter on ordinary streams (stdout, a file, a socket). While the
 * scenario has the cable unplugged the meter writes nothing and answers nothing.
 */
export function startStreamMeter(options: StreamMeterOptions): { finished: Promise<void>; stop(): void } {
  const simulation = createSimulation(options.scenario, options);
  const csv = options.csv ?? csvOptionsFor(simulation.scenario);
  const device = createMeterDevice({ ...options, csv, meter: simulation.meter, seed: simulation.seed });
  let plugged = true;
  const write = (chunks: Uint8Array[]) => {
    for (const chunk of chunks) options.output.write(chunk);
  };
  const onInput = (bytes: Buffer) => {
    if (plugged) write(device.receive(bytes));
  };
  options.input?.on('data', onInput);
  // A reader that goes away (a closed pipe) ends the meter instead of crashing it.
  options.output.on('error', () => player.stop());
  const player = simulation.play((reading) => {
    plugged = reading.plugged;
    write(device.sample(reading));
  });
  const finished = player.finished.then(() => {
    options.input?.off('data', onInput);
  });
  return { finished, stop: () => player.stop() };
}
