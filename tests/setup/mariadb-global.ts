import { resolve } from 'node:path';
import type { TestProject } from 'vitest/node';
import { provisionMariaDb } from '../../server/db/provisioner.js';
import { createLogger } from '../../server/log/logger.js';

/** Connection to the test MariaDB, handed to test files with `inject('mariadb')`. */
export interface TestMariaDbInfo {
  host: string;
  port: number;
  user: string;
  password: string;
  /** A database that always exists; test helpers create one database per test file beside it. */
  database: string;
}

declare module 'vitest' {
  export interface ProvidedContext {
    mariadb: TestMariaDbInfo;
  }
}

/** The test instance never touches the demo data (.data/mariadb, port 3307). */
export const TEST_MARIADB_PORT = 3317;
export const TEST_MARIADB_DIR = resolve('.data/test-mariadb');
// A test-only password on a loopback-only throwaway server.
const TEST_DB_PASSWORD = 'kneepoint-test-only';

/**
 * Vitest globalSetup for the integration and e2e projects: provisions the private test MariaDB
 * on 127.0.0.1:3317 (data in .data/test-mariadb), provides its connection info, and stops it
 * after the run. The app user may create and drop databases (one per test file).
 */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const port = Number(process.env.KNEEPOINT_TEST_DB_PORT ?? TEST_MARIADB_PORT);
  const mariadb = await provisionMariaDb({
    baseDir: TEST_MARIADB_DIR,
    port,
    database: 'kneepoint_test',
    user: 'kneepoint_test',
    password: TEST_DB_PASSWORD,
    grantAllDatabases: true,
    log: createLogger('test-mariadb'),
  });
  project.provide('mariadb', {
    host: mariadb.host, port: mariadb.port, user: mariadb.user, password: mariadb.password, database: mariadb.database,
  });
  return async () => {
    await mariadb.stop();
  };
}
