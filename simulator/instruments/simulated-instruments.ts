import { mkdirSync, rmdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { systemClock, type Clock } from '../engine/clock.js';
import type { ExternalDrive } from '../engine/external-drive.js';
import { instrumentsDrive } from './drive.js';
import { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from './instrument-specs.js';
import { openPtyInstrumentPort, type PtyInstrumentPort } from './pty-instrument.js';
import { createScpiControl } from './scpi-control.js';
import { SimInstrument } from './sim-instrument.js';

/** A simulated load and supply answering SCPI on their own pseudo-terminals, as a drive for one simulated pack. */
export interface SimulatedInstruments {
  readonly load: SimInstrument;
  readonly supply: SimInstrument;
  /** Hand this to the simulation: the instruments load and charge its pack. */
  readonly drive: ExternalDrive;
  /** Switches both outputs off, stops their watchdogs and closes the pseudo-terminals (socat removes the links). */
  stop(): Promise<void>;
}

/**
 * Starts the simulator's load and supply on SCPI pseudo-terminals at the two links (their
 * folder is made if missing). Without a meter of their own: the caller plays the pack.
 */
export async function startSimulatedInstruments(links: { loadLinkPath: string; supplyLinkPath: string }, clock: Clock = systemClock): Promise<SimulatedInstruments> {
  const load = new SimInstrument(SIM_LOAD_SPEC, clock);
  const supply = new SimInstrument(SIM_SUPPLY_SPEC, clock);
  const ports: PtyInstrumentPort[] = [];
  const scpi = (instrument: SimInstrument) => {
    const control = createScpiControl(instrument);
    return (bytes: Buffer) => control.receive(bytes.toString('latin1'));
  };
  try {
    for (const path of [links.loadLinkPath, links.supplyLinkPath]) mkdirSync(dirname(path), { recursive: true });
    ports.push(await openPtyInstrumentPort(links.loadLinkPath, scpi(load)));
    ports.push(await openPtyInstrumentPort(links.supplyLinkPath, scpi(supply)));
  } catch (error) {
    await Promise.all(ports.map((p) => p.close()));
    throw error;
  }
  return {
    load,
    supply,
    drive: instrumentsDrive([load, supply]),
    async stop() {
      load.armWatchdog(0);
      supply.armWatchdog(0);
      await Promise.all(ports.map((p) => p.close()));
      // The links' folder goes too once empty; one still holding another bench's links stays.
      for (const path of new Set([dirname(links.loadLinkPath), dirname(links.supplyLinkPath)])) {
        try {
          rmdirSync(path);
        } catch {
          // not empty, or already gone
        }
      }
    },
  };
}
