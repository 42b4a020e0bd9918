import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:net';
import { rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import mariadb from 'mariadb';
import { provisionMariaDb, type ProvisionedMariaDb, type ProvisionOptions } from '../../server/db/provisioner.js';
import { findRunningMariaDb, isAlive, stopMariaDb, waitFor } from '../../server/db/mariadb-process.js';
import { quietLogger } from '../../server/log/logger.js';

// Its own data directories and ports: never the demo (3307) or the shared test server (3317).
const BASE_DIR = resolve('.data/test-mariadb-provisioner');
const PORT = 3318;
const TAKEN_BASE_DIR = resolve('.data/test-mariadb-taken');
const TAKEN_PORT = 3319;
const FAIL_FAST_MS = 3_000;

const options: ProvisionOptions = {
  baseDir: BASE_DIR, port: PORT, database: 'prov_check', user: 'prov_user', password: 'prov-password-123', log: quietLogger,
};

async function query<T>(db: ProvisionedMariaDb, sql: string, values?: unknown[]): Promise<T> {
  const connection = await mariadb.createConnection({ host: db.host, port: db.port, user: db.user, password: db.password, database: db.database });
  try {
    return (await connection.query(sql, values)) as T;
  } finally {
    await connection.end();
  }
}

async function stopLeftovers(baseDir: string) {
  const pid = findRunningMariaDb(join(baseDir, 'data'), join(baseDir, 'mariadbd.pid'));
  if (pid !== undefined) await stopMariaDb(pid);
}

beforeAll(async () => {
  // A fresh data directory, so "starts" really initialises and starts.
  await stopLeftovers(BASE_DIR);
  rmSync(BASE_DIR, { recursive: true, force: true });
});
afterAll(async () => {
  await stopLeftovers(BASE_DIR);
  rmSync(BASE_DIR, { recursive: true, force: true });
  rmSync(TAKEN_BASE_DIR, { recursive: true, force: true });
});

describe('MariaDB provisioner', () => {
  it('initialises, starts on 127.0.0.1, creates the database and user, stops, and restarts with the data still there', async () => {
    const first = await provisionMariaDb(options);
    expect(first.reused).toBe(false);
    expect(isAlive(first.pid)).toBe(true);
    await query(first, 'CREATE TABLE packs (id INT PRIMARY KEY, label VARCHAR(40))');
    await query(first, 'INSERT INTO packs VALUES (?, ?)', [1, 'Voltara rack pack']);
    const bound = await query<Array<{ Value: string }>>(first, "SHOW VARIABLES LIKE 'bind_address'");
    expect(bound[0].Value).toBe('127.0.0.1');
    await first.stop();
    expect(isAlive(first.pid)).toBe(false);

    const second = await provisionMariaDb(options); // idempotent: same user, same database
    expect(second.reused).toBe(false);
    expect(second.pid).not.toBe(first.pid);
    const rows = await query<Array<{ label: string }>>(second, 'SELECT label FROM packs WHERE id = 1');
    expect(rows.map((row) => row.label)).toEqual(['Voltara rack pack']);
    await second.stop();
  });

  it('reuses a healthy server already running on the same data, and the last user stops it', async () => {
    const owner = await provisionMariaDb(options);
    const again = await provisionMariaDb(options);
    expect(again.reused).toBe(true);
    expect(again.pid).toBe(owner.pid);
    await again.stop();
    expect(isAlive(owner.pid)).toBe(true); // the first user still holds a lease
    await owner.stop();
    expect(isAlive(owner.pid)).toBe(false);
  });

  it('recovers after the server was killed with SIGKILL, keeping committed rows', async () => {
    const running = await provisionMariaDb(options);
    await query(running, 'INSERT INTO packs VALUES (?, ?)', [2, 'Hollis e-bike']);
    process.kill(running.pid, 'SIGKILL');
    await waitFor(() => !isAlive(running.pid), 10_000);
    await running.stop(); // nothing left to stop: this only drops the dead server's lease
    const recovered = await provisionMariaDb(options);
    const rows = await query<Array<{ id: number }>>(recovered, 'SELECT id FROM packs ORDER BY id');
    expect(rows.map((row) => row.id)).toEqual([1, 2]);
    await recovered.stop();
    expect(isAlive(recovered.pid)).toBe(false);
  });

  it('fails fast with a clear message when the port is taken by another program', async () => {
    const blocker: Server = createServer();
    await new Promise<void>((done) => blocker.listen(TAKEN_PORT, '127.0.0.1', () => done()));
    try {
      const started = Date.now();
      await expect(provisionMariaDb({ ...options, baseDir: TAKEN_BASE_DIR, port: TAKEN_PORT })).rejects.toThrow(
        new RegExp(`port ${TAKEN_PORT} on 127.0.0.1 is already in use`),
      );
      expect(Date.now() - started).toBeLessThan(FAIL_FAST_MS);
    } finally {
      await new Promise<void>((done) => blocker.close(() => done()));
    }
  });

  it("refuses the system MariaDB's port 3306", async () => {
    await expect(provisionMariaDb({ ...options, baseDir: TAKEN_BASE_DIR, port: 3306 })).rejects.toThrow(/3306/);
  });
});
