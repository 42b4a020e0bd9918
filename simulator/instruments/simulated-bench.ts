import { systemClock, type Clock } from '../engine/clock.js';
import { startPtyMeter, type PtyMeter, type PtyMeterOptions } from '../transport/pty-meter.js';
import { instrumentsDrive } from './drive.js';
import { createModbusControl } from './modbus-control.js';
import { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from './instrument-specs.js';
import { openPtyInstrumentPort, type InstrumentResponder, type PtyInstrumentPort } from './pty-instrument.js';
import { createScpiControl } from './scpi-control.js';
import { SimInstrument, type SimInstrumentSpec } from './sim-instrument.js';

/** How the simulated instruments speak on their ports. */
export type InstrumentProtocol = 'scpi' | 'modbus';

/** A meter plus an electronic load and a supply on their own pseudo-terminals, all on one simulated pack. */
export interface SimulatedBenchOptions extends Omit<PtyMeterOptions, 'drive'> {
  /** Where the server opens the load; omitted = no load. */
  loadLinkPath?: string;
  /** Where the server opens the supply; omitted = no supply. */
  supplyLinkPath?: string;
  /** SCPI (default) or Modbus RTU (unit 1, the register map of shared/schemas/instrument-presets.ts). */
  protocol?: InstrumentProtocol;
  loadSpec?: Partial<SimInstrumentSpec>;
  supplySpec?: Partial<SimInstrumentSpec>;
  /** The instruments' wall clock (watchdogs); the meter's pacing uses `clock`. */
  instrumentClock?: Clock;
}

/** A running simulated bench. The instruments' `totals` and `segments` are the truth tests compare with. */
export interface SimulatedBench {
  readonly meter: PtyMeter;
  readonly load: SimInstrument;
  readonly supply: SimInstrument;
  stop(): Promise<void>;
}

function responder(instrument: SimInstrument, protocol: InstrumentProtocol): InstrumentResponder {
  if (protocol === 'modbus') {
    const control = createModbusControl(instrument);
    return (bytes) => control.receive(bytes);
  }
  const control = createScpiControl(instrument);
  return (bytes) => control.receive(bytes.toString('latin1'));
}

/**
 * Starts the meter on its pseudo-terminal and the load and supply on theirs. The scenario's
 * rest steps are when the instruments drive the pack: a bench-control scenario is one long rest.
 */
export async function startSimulatedBench(options: SimulatedBenchOptions): Promise<SimulatedBench> {
  const clock = options.instrumentClock ?? systemClock;
  const load = new SimInstrument({ ...SIM_LOAD_SPEC, ...options.loadSpec }, clock);
  const supply = new SimInstrument({ ...SIM_SUPPLY_SPEC, ...options.supplySpec }, clock);
  const protocol = options.protocol ?? 'scpi';
  const ports: PtyInstrumentPort[] = [];
  let meter: PtyMeter | undefined;
  try {
    if (options.loadLinkPath) ports.push(await openPtyInstrumentPort(options.loadLinkPath, responder(load, protocol)));
    if (options.supplyLinkPath) ports.push(await openPtyInstrumentPort(options.supplyLinkPath, responder(supply, protocol)));
    meter = await startPtyMeter({ ...options, drive: instrumentsDrive([load, supply]) });
  } catch (error) {
    await Promise.all(ports.map((p) => p.close()));
    throw error;
  }
  const running = meter;
  return {
    meter: running,
    load,
    supply,
    async stop() {
      // Switch off the watchdogs' timers with the instruments, so nothing fires after the test.
      load.armWatchdog(0);
      supply.armWatchdog(0);
      await running.stop();
      await Promise.all(ports.map((p) => p.close()));
    },
  };
}
