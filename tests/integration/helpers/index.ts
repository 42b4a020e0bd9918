/**
 * Integration test helpers (real MariaDB from tests/setup/mariadb-global.ts):
 * - createTestContext(options?): a listening server on a fresh migrated database per test file,
 *   with TEST_USERS (one per role, password TEST_PASSWORD); `demo: true` adds the demo lab;
 *   `attachments: [...]` runs post-listen attachments; close() in afterAll drops the database.
 * - signInAs(t, role): supertest agent signed in, sending the session cookie and X-CSRF-Token.
 * - csrfAgent(t): anonymous agent with a CSRF token (for login and forgery tests).
 * - listApiRoutes(app): every method + path registered under /api, read from the router stack.
 */
export { createTestContext, TEST_PASSWORD, TEST_USERS, type TestContext, type TestContextOptions } from './test-context.js';
export { signInAs, csrfAgent, type SignedInAgent } from './sign-in.js';
export { listApiRoutes, concretePath, type ApiRoute } from './routes.js';
export { testConfig, TEST_LOGIN_MAX_FAILURES } from './test-config.js';
export { createTestDatabase, dropTestDatabase } from './test-database.js';
