import { resolve } from 'node:path';
import type { AppConfig, DatabaseConfig } from '../../../server/config/config.js';

/** Failed sign-ins allowed per window in tests (small, so the 429 test is quick). */
export const TEST_LOGIN_MAX_FAILURES = 5;

/** An AppConfig for tests: no environment, no secrets file, a fixed secret, no provisioning. */
export function testConfig(database: DatabaseConfig, overrides: Partial<AppConfig> = {}): AppConfig {
  return {
    mode: 'test',
    host: '127.0.0.1',
    port: 0,
    // One data folder per test database: a server's journal and spill never meet another file's runs.
    dataDir: resolve('.data/test-app', database.database),
    clientDir: resolve('.data/test-app/no-client'),
    db: { ...database, provision: false, mariadbDir: resolve('.data/test-mariadb') },
    sessionSecret: 'test-session-secret-that-is-long-enough-0123456789',
    cookieSecure: false,
    sessionMaxAgeMs: 3_600_000,
    bodyLimit: '100kb',
    loginMaxFailures: TEST_LOGIN_MAX_FAILURES,
    loginWindowMs: 60_000,
    demoPassword: 'northgate-demo',
    backup: { dir: null, everyMs: 24 * 3_600_000, keep: 7 },
    trustProxy: false,
    allowedHosts: [],
    ...overrides,
  };
}
