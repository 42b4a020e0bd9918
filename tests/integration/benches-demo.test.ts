import { afterAll, beforeAll, expect, it } from 'vitest';
import { attachBenchManager } from '../../server/benches/attach-bench-manager.js';
import { DEMO_BENCHES, seedDemoBenches } from '../../server/benches/seed-demo-benches.js';
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
    attachments: [attachBenchManager],
    log: { info: () => {}, warn: (m) => console.warn(m), error: (m, e) => console.error(m, e) },
  });
});
afterAll(async () => {
  await server?.close();
  if (databaseName) await dropTestDatabase(databaseName);
});

it('the demo lab has two simulator benches that the manager runs, and seeding twice adds none', async () => {
  const viewerAccount = DEMO_ACCOUNTS.find((a) => a.role === 'viewer')!;
  const viewer = await signInAs(server.url, 'viewer', { email: viewerAccount.email, password: server.ctx.config.demoPassword });
  const { body } = await viewer.get('/api/benches').expect(200);
  expect(body.benches.map((b: { name: string }) => b.name).sort()).toEqual(DEMO_BENCHES.map((b) => b.name).sort());
  for (const bench of body.benches) {
    expect(bench.source.kind).toBe('simulator');
    // A scenario name the simulator does not know would show as an error status.
    expect(['connected', 'receiving']).toContain(bench.status.state);
  }
  expect(server.ctx.services.benchManager!.benchIds()).toHaveLength(2);
  expect(await seedDemoBenches(server.ctx.sequelize)).toBe(0);
});
