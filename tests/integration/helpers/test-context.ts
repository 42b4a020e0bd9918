import { rm } from 'node:fs/promises';
import type { Express } from 'express';
import type { Server } from 'node:http';
import type { AppConfig } from '../../../server/config/config.js';
import type { AppContext, Logger } from '../../../server/app-context.js';
import { startServer, type Attachment, type RunningServer } from '../../../server/server.js';
import { seedDemo } from '../../../server/db/seed-demo.js';
import { demoInstrumentLinkDir } from '../../../server/benches/seed-demo-benches.js';
import { hashPassword } from '../../../server/auth/password.js';
import type { Role } from '../../../shared/schemas/user.js';
import { createTestDatabase, dropTestDatabase } from './test-database.js';
import { testConfig } from './test-config.js';

/** One account per role, created by createTestContext (unless `users: false`). */
export const TEST_PASSWORD = 'bench-test-password';
export const TEST_USERS: Record<Role, { email: string; name: string; role: Role }> = {
  admin: { email: 'admin@test.lab', name: 'Test Admin', role: 'admin' },
  technician: { email: 'tech@test.lab', name: 'Test Technician', role: 'technician' },
  viewer: { email: 'viewer@test.lab', name: 'Test Viewer', role: 'viewer' },
};

/** Options for createTestContext. */
export interface TestContextOptions {
  /** Create the three TEST_USERS (default true). */
  users?: boolean;
  /** Also seed the demo lab (Northgate accounts, batteries, settings). Default false. */
  demo?: boolean;
  /** Change any config value (e.g. loginMaxFailures, bodyLimit). */
  config?: Partial<AppConfig>;
  /** Post-listen attachments to run (default none; pass e.g. [attachLiveHub] or ATTACHMENTS). */
  attachments?: Attachment[];
  /** Receives the server's log instead of the quiet default (tests that read the log). */
  log?: Logger;
}

/** What a test gets: a listening server on its own fresh, migrated database. */
export interface TestContext {
  url: string;
  app: Express;
  httpServer: Server;
  ctx: AppContext;
  server: RunningServer;
  databaseName: string;
  /** Stops the server, closes the pool and drops the database. Call in afterAll. */
  close(): Promise<void>;
}

/**
 * Starts Kneepoint for one test file against a fresh database on the test MariaDB (provided by
 * tests/setup/mariadb-global.ts), migrated, with TEST_USERS (password TEST_PASSWORD) and
 * optionally the demo lab. The server listens on 127.0.0.1, port 0.
 *
 *   let t: TestContext;
 *   beforeAll(async () => { t = await createTestContext(); });
 *   afterAll(() => t.close());
 *   const tech = await signInAs(t, 'technician');   // supertest agent with cookie + X-CSRF-Token
 *   await tech.post('/api/batteries').send({...}).expect(201);
 */
export async function createTestContext(options: TestContextOptions = {}): Promise<TestContext> {
  const database = await createTestDatabase();
  let server: RunningServer;
  try {
    server = await startServer({
      config: testConfig(database, options.config),
      database,
      port: 0,
      attachments: options.attachments ?? [],
      log: options.log ?? { info: () => {}, warn: (m) => console.warn(m), error: (m, e) => console.error(m, e) },
    });
  } catch (error) {
    await dropTestDatabase(database.database);
    throw error;
  }
  const { models } = server.ctx;
  if (options.users ?? true) {
    const passwordHash = await hashPassword(TEST_PASSWORD);
    await models.User.bulkCreate(Object.values(TEST_USERS).map((user) => ({ ...user, passwordHash })));
  }
  if (options.demo) await seedDemo(models, server.ctx.config.demoPassword, { force: true, instrumentLinkDir: demoInstrumentLinkDir(server.ctx.config.dataDir) });
  return {
    url: server.url,
    app: server.app,
    httpServer: server.httpServer,
    ctx: server.ctx,
    server,
    databaseName: database.database,
    close: async () => {
      await server.close();
      await dropTestDatabase(database.database);
      if (server.ctx.config.dataDir.endsWith(database.database)) await rm(server.ctx.config.dataDir, { recursive: true, force: true });
    },
  };
}
