import { createHash } from 'node:crypto';
import { join } from 'node:path';
import type { Sequelize } from 'sequelize';
import { CreateBenchRequestSchema, type CreateBenchRequest } from '../../shared/schemas/bench.js';
import { benchModel } from './bench-model.js';

/**
 * The demo lab's benches: two simulated ones, so the demo streams without hardware.
 * 20× speed plays the two-hour capacity test in about seven minutes.
 */
export const DEMO_BENCHES: CreateBenchRequest[] = [
  {
    name: 'Bench A: 12 V LFP capacity',
    source: { kind: 'simulator', scenario: 'lfp-12v-100ah-cp-cutoff', speed: 20, seed: 11 },
    notes: 'Simulated Voltara 12.8 V 100 Ah pack on a 600 W constant-power load, to BMS cutoff and reconnect.',
    // A demo meter's data-sheet accuracy (invented, for the demo only).
    meterAccuracy: { voltsGainPercent: 0.1, voltsOffsetVolts: 0.01, ampsGainPercent: 0.2, ampsOffsetAmps: 0.02 },
  },
  {
    name: 'Bench B: cold chamber',
    source: { kind: 'simulator', scenario: 'lfp-48v-30ah-pwm-heater', speed: 20, seed: 12 },
    notes: 'Simulated Corvane Power 51.2 V 30 Ah pack with a PWM heater film, charged in the cold chamber. Never charge lithium below 0 °C without a heater.',
  },
];

/** Name of the demo bench whose simulated pack has a controllable load and supply. */
export const DEMO_CONTROLLED_BENCH_NAME = 'Bench C: controlled load and supply';
/** Hex digits of the data folder's hash in the instruments' link folder: enough to keep two servers apart. */
const LINK_DIR_HASH_CHARS = 12;

/**
 * Where the demo's simulated instruments put their pseudo-terminal links: a folder under /tmp
 * named after the server's data folder, so two servers on one machine never share a link and
 * a restarted server finds its own again (links stay out of the repository: Tailwind hangs on them).
 */
export function demoInstrumentLinkDir(dataDir: string): string {
  return join('/tmp', `kneepoint-instruments-${createHash('sha256').update(dataDir).digest('hex').slice(0, LINK_DIR_HASH_CHARS)}`);
}

/**
 * The demo bench a programme can drive: a small LFP pack on the simulator's load and supply,
 * whose SCPI ports are pseudo-terminals in `linkDir`. 60× speed plays a full capacity programme
 * (about three simulated hours) in about three minutes.
 */
export function demoControlledBench(linkDir: string): CreateBenchRequest {
  return {
    name: DEMO_CONTROLLED_BENCH_NAME,
    source: {
      kind: 'simulator',
      scenario: 'bench-control-lfp-12v',
      speed: 60,
      seed: 13,
      instruments: { loadLinkPath: join(linkDir, 'bench-c-load'), supplyLinkPath: join(linkDir, 'bench-c-supply') },
    },
    notes: 'Simulated Ferrowatt 12.8 V 20 Ah pack on the simulated electronic load and supply (SCPI): run the demo full capacity programme here.',
  };
}

/**
 * Adds the demo benches when the lab has none; returns how many were added. With `linkDir`,
 * the controlled bench too (its instruments are seeded by seedDemoProgrammes).
 */
export async function seedDemoBenches(sequelize: Sequelize, linkDir?: string): Promise<number> {
  const Bench = benchModel(sequelize);
  if ((await Bench.count()) > 0) return 0;
  const benches = linkDir ? [...DEMO_BENCHES, demoControlledBench(linkDir)] : DEMO_BENCHES;
  const rows = benches.map((input) => CreateBenchRequestSchema.parse(input)).map((b) => ({ ...b, source: JSON.stringify(b.source), meterAccuracy: b.meterAccuracy ? JSON.stringify(b.meterAccuracy) : null }));
  await Bench.bulkCreate(rows);
  return rows.length;
}
