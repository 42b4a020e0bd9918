import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { HealthSchema } from '../../shared/schemas/health.js';

/**
 * The API's side of a database outage, on the real server and MariaDB with the state set by
 * hand (the fault suite under tests/integration/faults kills and stops a real MariaDB):
 * refused at once with 503 and a clear message while the database is away, queries already
 * waiting are released at the moment the state changes, and all is normal once it is back.
 */
const FAST_MS = 500;
let t: TestContext;
let viewer: SignedInAgent;

/**
 * Holds the database state the test sets: the server's own watch keeps pinging the (healthy)
 * test database and would report it up again within 250 ms.
 */
function holdState() {
  const health = t.ctx.services.databaseHealth!;
  const set = health.set.bind(health);
  health.set = () => undefined;
  return {
    set,
    release() {
      health.set = set;
      set('up');
    },
  };
}

beforeAll(async () => {
  t = await createTestContext();
  viewer = await signInAs(t, 'viewer');
});
afterAll(() => t?.close());

describe('while the database is away', () => {
  it('reports up on GET /api/health without a session', async () => {
    const res = await fetch(`${t.url}/api/health`);
    expect(res.status).toBe(200);
    expect(HealthSchema.parse(await res.json()).database).toMatchObject({ state: 'up', supervised: false, restarts: 0 });
  });

  it('answers 503 at once with a clear message, before reading the session, and recovers when it is back', async () => {
    const health = holdState();
    health.set('stalled', 'the server (pid 1) gave no answer within 1000 ms');
    try {
      const started = performance.now();
      const res = await viewer.get('/api/runs');
      expect(performance.now() - started).toBeLessThan(FAST_MS);
      expect(res.status).toBe(503);
      expect(res.headers['retry-after']).toBe('5');
      expect(res.body.error.message).toBe('The database is not answering (stalled). Recording and live readings continue; try again in a few seconds.');
      const h = await fetch(`${t.url}/api/health`);
      expect(h.status).toBe(503);
      expect(HealthSchema.parse(await h.json()).database).toMatchObject({ state: 'stalled', lastProblem: expect.stringMatching(/no answer/) });
    } finally {
      health.release();
    }
    await viewer.get('/api/runs').expect(200);
  });

  it('releases a query already waiting the moment the database is known to be away, and refuses new ones', async () => {
    const health = holdState();
    const slow = t.ctx.sequelize.query('SELECT SLEEP(5) AS s', { type: QueryTypes.SELECT });
    const started = performance.now();
    setTimeout(() => health.set('down', 'the MariaDB server process has exited'), 100);
    try {
      await expect(slow).rejects.toMatchObject({ name: 'DatabaseUnavailableError' });
      expect(performance.now() - started).toBeLessThan(FAST_MS + 100);
      await expect(t.ctx.models.User.count()).rejects.toMatchObject({ name: 'DatabaseUnavailableError', message: expect.stringMatching(/has stopped/) });
    } finally {
      health.release();
    }
    expect(await t.ctx.models.User.count()).toBe(3);
  });

  it('releases a transaction caught half-way at once, and nothing of it is committed', async () => {
    await t.ctx.sequelize.query('CREATE TABLE half_done (id INT PRIMARY KEY) ENGINE=InnoDB');
    const work = t.ctx.sequelize.transaction(async (transaction) => {
      await t.ctx.sequelize.query('INSERT INTO half_done (id) VALUES (1)', { transaction });
      await t.ctx.sequelize.query('SELECT SLEEP(2)', { transaction });
    });
    const health = holdState();
    setTimeout(() => health.set('stalled', 'test'), 200);
    const started = performance.now();
    try {
      await expect(work).rejects.toMatchObject({ name: 'DatabaseUnavailableError' });
      expect(performance.now() - started).toBeLessThan(FAST_MS + 200);
    } finally {
      health.release();
    }
    // The discarded connection ends once its query has run, and the server rolls its transaction back.
    await new Promise((r) => setTimeout(r, 3000));
    const [row] = await t.ctx.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM half_done', { type: QueryTypes.SELECT });
    expect(Number(row!.n)).toBe(0);
  });
});
