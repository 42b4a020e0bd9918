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

/** Adds the demo benches when the lab has none; returns how many were added. */
export async function seedDemoBenches(sequelize: Sequelize): Promise<number> {
  const Bench = benchModel(sequelize);
  if ((await Bench.count()) > 0) return 0;
  const rows = DEMO_BENCHES.map((input) => CreateBenchRequestSchema.parse(input)).map((b) => ({ ...b, source: JSON.stringify(b.source), meterAccuracy: b.meterAccuracy ? JSON.stringify(b.meterAccuracy) : null }));
  await Bench.bulkCreate(rows);
  return rows.length;
}
