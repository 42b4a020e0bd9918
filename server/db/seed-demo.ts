import type { CoreModels } from './models/index.js';
import type { BatteryInput } from '../../shared/schemas/battery.js';
import type { Role } from '../../shared/schemas/user.js';
import { LabSettingsSchema } from '../../shared/schemas/lab-settings.js';
import { BATTERY_OPTIONAL_DEFAULTS } from './models/battery.js';
import { hashPassword } from '../auth/password.js';
import { getLabSettings, saveLabSettings } from '../settings/settings-service.js';
import type { AppContext } from '../app-context.js';
import { batteryLookup } from '../runs/battery-facts.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { seedDemoHistory } from '../runs/seed-demo-history.js';
import { seedDemoBenches } from '../benches/seed-demo-benches.js';
import { seedDemoInstruments } from '../instruments/seed-demo-instruments.js';
import { seedDemoProgrammes } from '../programmes/seed-demo-programmes.js';

/** The fictional lab's name. */
export const DEMO_LAB_NAME = 'Northgate Cell Lab';

/** Demo accounts, one per role (fictional people). They share the configured demo password. */
export const DEMO_ACCOUNTS: ReadonlyArray<{ email: string; name: string; role: Role }> = [
  { email: 'ada@northgate.lab', name: 'Ada Marsh', role: 'admin' },
  { email: 'tomas@northgate.lab', name: 'Tomas Ferrand', role: 'technician' },
  { email: 'vera@northgate.lab', name: 'Vera Lind', role: 'viewer' },
];

/** Fictional packs of fictional brands; the figures are invented for the demo. */
export const DEMO_BATTERIES: BatteryInput[] = [
  { label: 'VT-48 rack pack #1', brand: 'Voltara', model: 'Rackline 48-100', chemistry: 'lfp', cellsInSeries: 16, cellsInParallel: 1,
    ratedAh: 100, ratedWh: 5120, bmsRatedAmps: 100, massKg: 46, price: 1290, priceCurrency: 'EUR', serialNumber: 'VT48-2311-0042',
    sender: 'Harbour Street Solar Co-op', notes: 'Sent for an acceptance test after a warranty swap.' },
  { label: 'Hollis e-bike 36 V', brand: 'Hollis Power', model: 'Trail 36-14', chemistry: 'nmc', cellsInSeries: 10, cellsInParallel: 4,
    ratedAh: 14, ratedWh: 504, bmsRatedAmps: 25, massKg: 3.1, price: 389, priceCurrency: 'EUR', serialNumber: 'HP-T36-88213',
    sender: 'Riverside Cycles', notes: 'Customer reports early cutoff on hills.' },
  { label: 'Kestrel 12 V camper', brand: 'Kestrel Energy', model: 'Nomad 12-50', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1,
    ratedAh: 50, ratedWh: 640, bmsRatedAmps: 50, massKg: 6.2, price: 279, priceCurrency: 'EUR', serialNumber: 'KE-N12-5007',
    sender: null, notes: 'Has a low-temperature charge cutoff: check below 0 °C.' },
  { label: 'Hollis standby 12 V', brand: 'Hollis Power', model: 'Keep 12-35', chemistry: 'lead-acid', cellsInSeries: 6, cellsInParallel: 1,
    ratedAh: 35, ratedWh: 420, bmsRatedAmps: null, massKg: 10.8, price: 95, priceCurrency: 'EUR', serialNumber: 'HP-K12-1180',
    sender: 'Northgate facilities', notes: 'Sealed lead-acid: ventilate while charging (hydrogen).' },
  { label: 'Corvane heated 48 V', brand: 'Corvane Power', model: 'Frostline 48-30H', chemistry: 'lfp', cellsInSeries: 16, cellsInParallel: 1,
    ratedAh: 30, ratedWh: 1536, bmsRatedAmps: 60, massKg: 14.5, price: 749, priceCurrency: 'EUR', serialNumber: 'CP-F48-0319',
    sender: 'Fjellvik Cabins', notes: 'Heater film pulsed by the BMS. Never charge below 0 °C without the heater working.',
    // The maker's stated protections (invented for the demo); the simulated Bench B pack behaves this way.
    protectionSpecs: [
      { protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, releaseValue: 3, thresholdTolerance: null, delayToleranceSeconds: null },
      { protection: 'heater-on', thresholdValue: 2, delaySeconds: null, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null },
      { protection: 'heater-off', thresholdValue: 7, delaySeconds: null, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null },
      { protection: 'over-temp-discharge', thresholdValue: 60, delaySeconds: 10, releaseValue: 50, thresholdTolerance: null, delayToleranceSeconds: null },
      { protection: 'low-voltage', thresholdValue: 40, delaySeconds: 2, releaseValue: 40.8, thresholdTolerance: null, delayToleranceSeconds: null },
      { protection: 'over-current', thresholdValue: 60, delaySeconds: 1, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null },
    ] },
  { label: 'Wren 12 V bench pack', brand: 'Ferrowatt', model: 'Cellgrid 12-20', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1,
    ratedAh: 20, ratedWh: 256, bmsRatedAmps: 40, massKg: 2.7, price: 139, priceCurrency: 'EUR', serialNumber: 'FW-C12-2044',
    sender: null, notes: 'The pack on the simulated Bench C: run the demo full capacity programme on it.' },
];

/** Result of seeding: whether anything was written. */
export interface SeedResult {
  seeded: boolean;
}

/**
 * Seeds the demo lab (settings, three accounts, six packs) when the database has no users yet,
 * or regardless with `force` (tests that already created their own users). With
 * `instrumentLinkDir`, also the bench with a controllable load and supply and the demo programme.
 */
export async function seedDemo(models: CoreModels, demoPassword: string, options: { force?: boolean; instrumentLinkDir?: string } = {}): Promise<SeedResult> {
  if (!options.force && (await models.User.count()) > 0) return { seeded: false };
  const passwordHash = await hashPassword(demoPassword);
  await models.User.sequelize!.transaction(async (transaction) => {
    const users = await models.User.bulkCreate(DEMO_ACCOUNTS.map((account) => ({ ...account, passwordHash })), { transaction });
    const technician = users.find((user) => user.role === 'technician');
    await models.Battery.bulkCreate(
      DEMO_BATTERIES.map((battery) => ({ ...BATTERY_OPTIONAL_DEFAULTS, ...battery, createdById: technician?.id ?? null })),
      { transaction },
    );
  });
  await saveLabSettings(models, LabSettingsSchema.parse({ labName: DEMO_LAB_NAME }), null);
  await seedDemoBenches(models.User.sequelize!, options.instrumentLinkDir);
  await seedDemoInstruments(models.User.sequelize!);
  await seedDemoProgrammes(models.User.sequelize!);
  return { seeded: true };
}

/**
 * The demo lab's past runs (server/runs/seed-demo-history.ts), imported once when the demo is
 * first seeded, so that runs, pack trends, compare and reports have something to show.
 */
export async function seedDemoLabHistory(ctx: AppContext): Promise<number[]> {
  const technician = await ctx.models.User.findOne({ where: { role: 'technician' }, order: [['id', 'ASC']] });
  if (!technician) return [];
  const lab = await getLabSettings(ctx.models);
  const facts = batteryLookup(ctx);
  return seedDemoHistory({
    sequelize: ctx.sequelize,
    repo: new RunsRepo(ctx.sequelize),
    batteryByLabel: async (label) => {
      const row = await ctx.models.Battery.findOne({ where: { label } });
      return row ? facts(row.id) : null;
    },
    technician: { id: technician.id, name: technician.name },
    acceptancePercent: lab.acceptancePercent,
    timeZone: lab.timeZone,
  });
}
