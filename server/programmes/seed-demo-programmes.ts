import { QueryTypes, type Sequelize } from 'sequelize';
import { BenchInstrumentsSchema } from '../../shared/schemas/bench-instruments.js';
import { SimulatorSourceConfigSchema } from '../../shared/schemas/bench.js';
import { SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../shared/schemas/instrument-presets.js';
import { ProgrammeInputSchema, type ProgrammeInput } from '../../shared/schemas/programme.js';
import { DEMO_CONTROLLED_BENCH_NAME } from '../benches/seed-demo-benches.js';
import { BenchInstrumentsRepo } from './bench-instruments-repo.js';
import { ProgrammesRepo } from './programmes-repo.js';

/** The demo's rests, s of the server's clock (at 60× half an hour of the simulated pack). */
const DEMO_REST_SECONDS = 30;

/**
 * The demo's full capacity programme for the controlled bench's pack (a fictional 12.8 V 20 Ah
 * LFP, four cells): charge CC-CV, rest, discharge at 1C to the end voltage, rest, recharge.
 * The figures are the demo's own, within the LFP limits of docs/programmes.md. A step's time runs
 * on the server's clock (a real bench's rest is wall-clock time), so the rests are short: at the
 * demo's 60× each half minute is half an hour of the simulated pack's rest.
 */
export const DEMO_PROGRAMME: ProgrammeInput = ProgrammeInputSchema.parse({
  name: 'Demo: 12.8 V 20 Ah full capacity (1C)',
  description: 'Charge to 14.2 V at 20 A until 2 A, rest 30 s, discharge 20 A to 11.2 V, rest 30 s, recharge. For the simulated Bench C: short rests keep the demo to minutes.',
  chemistry: 'lfp',
  cellsInSeries: 4,
  maxCurrentAmps: 25,
  steps: [
    { kind: 'charge', volts: 14.2, currentAmps: 20, taperAmps: 2, maxSeconds: 3 * 3600 },
    { kind: 'rest', maxSeconds: DEMO_REST_SECONDS },
    { kind: 'discharge', mode: 'cc', value: 20, endVolts: 11.2 },
    { kind: 'rest', maxSeconds: DEMO_REST_SECONDS },
    { kind: 'charge', volts: 14.2, currentAmps: 20, taperAmps: 2, maxSeconds: 3 * 3600 },
  ],
});

/**
 * Gives the demo's controlled bench its load and supply (SCPI on the links its simulated source
 * opens) and saves the demo programme, when that bench exists and has no instruments yet.
 * Returns whether anything was written.
 */
export async function seedDemoProgrammes(sequelize: Sequelize): Promise<boolean> {
  const [bench] = await sequelize.query<{ id: number; source: string | object }>('SELECT id, source FROM benches WHERE name = ?', {
    replacements: [DEMO_CONTROLLED_BENCH_NAME],
    type: QueryTypes.SELECT,
  });
  if (!bench) return false;
  const source = SimulatorSourceConfigSchema.parse(typeof bench.source === 'string' ? JSON.parse(bench.source) : bench.source);
  if (!source.instruments) return false;
  const repo = new BenchInstrumentsRepo(sequelize);
  const current = await repo.get(bench.id);
  if (current.load || current.supply) return false;
  await repo.put(
    bench.id,
    BenchInstrumentsSchema.parse({
      load: { protocol: 'scpi', id: 'demo-load', role: 'load', port: { path: source.instruments.loadLinkPath }, commands: SIM_LOAD_SCPI },
      supply: { protocol: 'scpi', id: 'demo-supply', role: 'supply', port: { path: source.instruments.supplyLinkPath }, commands: SIM_SUPPLY_SCPI },
    }),
  );
  const programmes = new ProgrammesRepo(sequelize);
  if (!(await programmes.list()).some((p) => p.name === DEMO_PROGRAMME.name)) await programmes.create(DEMO_PROGRAMME, null);
  return true;
}
