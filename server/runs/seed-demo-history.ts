import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Sequelize } from 'sequelize';
import { createSimulation, type ScenarioInput } from '../../simulator/index.js';
import { lfpBms, lfpThermal } from '../../simulator/scenarios/lfp-defaults.js';
import { MS_PER_S } from '../../shared/units/time.js';
import { importRun } from './import-service.js';
import type { BatteryFacts } from './measure-config.js';
import type { RunsRepo } from './runs-repo.js';

/**
 * One finished run of the demo lab's past: a simulated pack of our own specification,
 * logged as a bench logger would (ISO date-times, volts, amps, °C) and imported through the
 * production importer, so the run page, the pack's capacity trend, the compare page and the
 * reports have something to show on a fresh start. Everything here is invented for the demo.
 */
export interface DemoHistoryRun {
  /** Label of the demo pack (server/db/seed-demo.ts DEMO_BATTERIES) the run belongs to. */
  batteryLabel: string;
  name: string;
  tags: string[];
  /** When the log's first line was taken (UTC). */
  startedAtIso: string;
  endVolts: number;
  /** Lead-acid: the electrolyte temperature at the start, °C. */
  electrolyteTempCelsius?: number;
  scenario: ScenarioInput;
  /** A technician's note at this run time. */
  note: { elapsedSeconds: number; text: string };
}

const HOUR_SECONDS = 3600;

/** The four past runs of the demo lab: two of one pack (a trend), a weak pack that fails, a lead-acid standby battery. */
export const DEMO_HISTORY: readonly DemoHistoryRun[] = [
  {
    batteryLabel: 'Kestrel 12 V camper', name: 'Kestrel camper: acceptance, 0.2 C', tags: ['acceptance', 'demo'],
    startedAtIso: '2026-06-03T08:10:00Z', endVolts: 10,
    scenario: lfpCapacity('demo-history-kestrel-june', 50, { capacityFactor: 1.03, amps: 10, readingPeriodSeconds: 5 }),
    note: { elapsedSeconds: 600, text: 'Charged to 14.4 V and rested 2 h before the test. Ambient 23 °C.' },
  },
  {
    batteryLabel: 'Kestrel 12 V camper', name: 'Kestrel camper: re-test after a season, 0.2 C', tags: ['re-test', 'demo'],
    startedAtIso: '2026-11-18T09:30:00Z', endVolts: 10,
    scenario: lfpCapacity('demo-history-kestrel-november', 50, { capacityFactor: 0.99, amps: 10, readingPeriodSeconds: 5 }),
    note: { elapsedSeconds: 900, text: 'Back from five months in a camper. Terminals clean, case undamaged.' },
  },
  {
    batteryLabel: 'Wren 12 V bench pack', name: 'Wren bench pack: 1 C to protection', tags: ['acceptance', 'demo'],
    startedAtIso: '2026-10-07T13:00:00Z', endVolts: 10,
    scenario: lfpCapacity('demo-history-wren-weak-cell', 20, { capacityFactor: 1, amps: 20, readingPeriodSeconds: 2, weakCell: 0.84 }),
    note: { elapsedSeconds: 1200, text: 'Protection opened early. Pack set aside for a teardown: one cell group suspected.' },
  },
  {
    batteryLabel: 'Hollis standby 12 V', name: 'Hollis standby: 20-hour rate to 10.5 V', tags: ['standby', 'demo'],
    startedAtIso: '2026-09-14T07:00:00Z', endVolts: 10.5, electrolyteTempCelsius: 25,
    scenario: {
      name: 'demo-history-hollis-standby', title: 'Hollis standby 12 V 35 Ah sealed lead-acid at 1.75 A', description: 'Demo history.',
      pack: {
        label: 'Hollis standby 12 V', chemistry: 'lead-acid', cellsInSeries: 6, ratedAh: 35, capacityFactor: 1.01, initialSoc: 1,
        initialTempCelsius: 25, thermal: { heatCapacityJPerK: 11_000, toAmbientKPerW: 0.5 },
      },
      ambient: [{ atSeconds: 0, tempCelsius: 25 }],
      // The load's own cutoff is set a little under the test's 10.5 V, so that the log holds the
      // crossing and the readings that confirm it.
      program: [{ kind: 'discharge', load: { mode: 'cc', amps: 1.75 }, endVolts: 10.3, maxSeconds: 24 * HOUR_SECONDS }, { kind: 'rest', maxSeconds: 600 }],
      meter: { readingPeriodSeconds: 10, voltsNoise: 0.002, ampsNoise: 0.005, tempNoise: 0.05 },
      // A slow discharge: 2 s physics steps keep the seeding quick.
      maxPhysicsStepSeconds: 2,
    },
    note: { elapsedSeconds: 1800, text: 'Ventilated bay (hydrogen). Sealed case: no electrolyte reading, case temperature used.' },
  },
];

/** A charged 4-cell LFP pack on a constant-current load to its BMS trip, then a rest for the reconnect. */
function lfpCapacity(
  name: string, ratedAh: number,
  o: { capacityFactor: number; amps: number; readingPeriodSeconds: number; weakCell?: number },
): ScenarioInput {
  return {
    name, title: `${ratedAh} Ah LFP at ${o.amps} A`, description: 'Demo history.',
    pack: {
      label: name, chemistry: 'lfp', cellsInSeries: 4, ratedAh, capacityFactor: o.capacityFactor, initialSoc: 1, initialTempCelsius: 23,
      ...(o.weakCell ? { cells: [{ index: 1, capacityFactor: o.weakCell, resistanceFactor: 1.2 }] } : {}),
      thermal: lfpThermal(4, ratedAh),
    },
    bms: lfpBms(),
    ambient: [{ atSeconds: 0, tempCelsius: 23 }],
    program: [
      { kind: 'discharge', load: { mode: 'cc', amps: o.amps }, maxSeconds: 8 * HOUR_SECONDS, stopWhen: 'bms-trip' },
      { kind: 'rest', maxSeconds: 300 },
    ],
    meter: { readingPeriodSeconds: o.readingPeriodSeconds, voltsNoise: 0.002, ampsNoise: 0.01, tempNoise: 0.05 },
    // One physics step a reading keeps the seeding quick; the BMS delays (2 s) still hold.
    maxPhysicsStepSeconds: Math.min(o.readingPeriodSeconds, 1),
  };
}

/** The run as a bench logger's CSV: ISO date-times, volts, amps (positive = discharge) and the cell temperature. */
export function demoHistoryCsv(run: DemoHistoryRun): string {
  const startMs = Date.parse(run.startedAtIso);
  const lines = ['Time,Voltage (V),Current (A),Cell temperature (°C)'];
  for (const frame of createSimulation(run.scenario, { seed: 7 }).frames()) {
    const cell = frame.temps?.cell;
    lines.push(`${new Date(startMs + frame.t * MS_PER_S).toISOString()},${frame.volts.toFixed(3)},${frame.amps.toFixed(3)},${cell === undefined ? '' : cell.toFixed(1)}`);
  }
  return `${lines.join('\n')}\n`;
}

export interface DemoHistoryDeps {
  sequelize: Sequelize;
  repo: RunsRepo;
  batteryByLabel: (label: string) => Promise<BatteryFacts | null>;
  /** The technician who "recorded" the history. */
  technician: { id: number; name: string };
  acceptancePercent: number;
  timeZone: string;
}

/** Imports the demo lab's past runs (a fresh demo only); returns their ids. */
export async function seedDemoHistory(deps: DemoHistoryDeps, runs: readonly DemoHistoryRun[] = DEMO_HISTORY): Promise<number[]> {
  const dir = await mkdtemp(join(tmpdir(), 'kneepoint-demo-history-'));
  const ids: number[] = [];
  try {
    for (const [i, run] of runs.entries()) {
      const filePath = join(dir, `history-${i}.csv`);
      await writeFile(filePath, demoHistoryCsv(run));
      const result = await importRun(deps.sequelize, deps.repo, {
        filePath, name: run.name, tags: run.tags, battery: await deps.batteryByLabel(run.batteryLabel), endVolts: run.endVolts,
        currentSign: 'discharge-positive', columns: {}, userId: deps.technician.id, timeZone: deps.timeZone,
        acceptancePercent: deps.acceptancePercent, electrolyteTempCelsius: run.electrolyteTempCelsius,
      });
      await deps.repo.insertEvent(result.run.id, { type: 'annotation', elapsedSeconds: run.note.elapsedSeconds, text: run.note.text, author: deps.technician.name }, deps.technician.id);
      ids.push(result.run.id);
    }
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
  return ids;
}
