import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/compose/bench-root.js';
import { DEMO_BENCHES, DEMO_CONTROLLED_BENCH_NAME, seedDemoBenches } from '../../server/benches/seed-demo-benches.js';
import { BenchInstrumentsRepo } from '../../server/programmes/bench-instruments-repo.js';
import { StoredBenchInstruments } from '../../server/programmes/bench-instruments-provider.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import { attachRecording } from '../../server/compose/recording-root.js';
import { SIM_LOAD_SPEC, SIM_SUPPLY_SPEC } from '../../simulator/index.js';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { createTestDatabase, dropTestDatabase, signInAs, testConfig } from './helpers/index.js';

let server: RunningServer;
let databaseName: string;
beforeAll(async () => {
  const database = await createTestDatabase();
  databaseName = database.database;
  // The real start-up order: migrate, seed the demo lab, listen, then attachments.
  server = await startServer({
    config: testConfig(database),
    database,
    port: 0,
    seedDemo: true,
    attachments: [attachBenchManager, attachRecording, attachProgrammes],
    log: { info: () => {}, warn: (m) => console.warn(m), error: (m, e) => console.error(m, e) },
  });
});
afterAll(async () => {
  await server?.close();
  if (databaseName) await dropTestDatabase(databaseName);
});

it('the demo lab has three simulator benches that the manager runs, and seeding twice adds none', async () => {
  const viewerAccount = DEMO_ACCOUNTS.find((a) => a.role === 'viewer')!;
  const viewer = await signInAs(server.url, 'viewer', { email: viewerAccount.email, password: server.ctx.config.demoPassword });
  const { body } = await viewer.get('/api/benches').expect(200);
  expect(body.benches.map((b: { name: string }) => b.name).sort()).toEqual([...DEMO_BENCHES.map((b) => b.name), DEMO_CONTROLLED_BENCH_NAME].sort());
  for (const bench of body.benches) {
    expect(bench.source.kind).toBe('simulator');
    // A scenario name the simulator does not know would show as an error status.
    expect(['connected', 'receiving']).toContain(bench.status.state);
  }
  expect(server.ctx.services.benchManager!.benchIds()).toHaveLength(3);
  expect(await seedDemoBenches(server.ctx.sequelize)).toBe(0);
});

it('the controlled demo bench has a load and a supply that answer SCPI through its stored settings, and a demo programme', async () => {
  const technicianAccount = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;
  const technician = await signInAs(server.url, 'technician', { email: technicianAccount.email, password: server.ctx.config.demoPassword });
  const { body } = await technician.get('/api/benches').expect(200);
  const bench = body.benches.find((b: { name: string }) => b.name === DEMO_CONTROLLED_BENCH_NAME);
  const links = bench.source.instruments;
  // Links live outside the repository (Tailwind hangs on a pseudo-terminal link).
  expect(links.loadLinkPath.startsWith('/tmp/')).toBe(true);
  const programmes = await technician.get('/api/programmes').expect(200);
  expect(programmes.body.programmes.map((p: { name: string }) => p.name).some((n: string) => n.startsWith('Demo:'))).toBe(true);
  // The stored driver settings open the links the simulated source made, as the programme runner does.
  const provider = new StoredBenchInstruments(new BenchInstrumentsRepo(server.ctx.sequelize));
  try {
    await expect.poll(() => provider.forBench(bench.id).then(() => true, () => false), { timeout: 10_000 }).toBe(true);
    const instruments = (await provider.forBench(bench.id))!;
    expect(await instruments.load!.identify()).toBe(SIM_LOAD_SPEC.idn);
    expect(await instruments.supply!.identify()).toBe(SIM_SUPPLY_SPEC.idn);
    expect((await instruments.load!.read()).outputOn).toBe(false);
  } finally {
    await provider.close();
  }
});

it('a fresh simulated pack on the controlled bench makes new instrument links, and the next programme reopens them', async () => {
  const manager = server.ctx.services.benchManager!;
  const provider = server.ctx.services.benchInstruments!;
  const [bench] = await server.ctx.sequelize.query<{ id: number }>('SELECT id FROM benches WHERE name = ?', { replacements: [DEMO_CONTROLLED_BENCH_NAME], type: QueryTypes.SELECT });
  const identify = async () => (await provider.forBench(bench!.id))!.load!.identify();
  await expect.poll(() => identify().catch(() => null), { timeout: 10_000 }).toBe(SIM_LOAD_SPEC.idn);
  expect(await manager.freshSimulation(bench!.id)).toBe(true);
  // The old links are gone with their socat; the provider was told to let go, so this opens the new ones.
  await expect.poll(() => identify().catch(() => null), { timeout: 10_000 }).toBe(SIM_LOAD_SPEC.idn);
});
