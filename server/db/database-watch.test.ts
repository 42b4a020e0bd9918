import { describe, expect, it } from 'vitest';
import { DatabaseHealth } from './database-health.js';
import { watchDatabase, type SupervisedServer } from './database-watch.js';

/** A database and its process under the test's control. */
function fakeDatabase() {
  const db = {
    answers: true,
    process: 'running' as 'running' | 'stopped' | 'gone',
    startFails: false,
    starts: 0,
    pid: 100,
  };
  const server: SupervisedServer = {
    running: () => (db.process === 'gone' ? undefined : { pid: db.pid, stopped: db.process === 'stopped' }),
    ensureRunning: async () => {
      if (db.startFails) throw new Error('mariadbd exited with code 1 during start-up');
      db.starts++;
      db.pid++;
      db.process = 'running';
      db.answers = true;
      return db.pid;
    },
  };
  const probe = { check: async () => db.answers && db.process === 'running', close: async () => undefined };
  return { db, server, probe };
}

function setUp(supervised = true) {
  const { db, server, probe } = fakeDatabase();
  let nowMs = 0;
  const now = () => nowMs;
  const log: string[] = [];
  const health = new DatabaseHealth(supervised, now);
  const watch = watchDatabase({
    health, probe, server: supervised ? server : undefined, log: { info: (m) => log.push(m), warn: (m) => log.push(m), error: (m, e) => log.push(`${m}: ${String(e)}`) }, now, intervalMs: 1e9, restartDelaysMs: [0, 1000, 5000],
  });
  return { db, health, watch, log, advance: (ms: number) => (nowMs += ms) };
}

describe('database watch', () => {
  it('restarts a MariaDB that died, at once, counts and logs it, and reports up again', async () => {
    const { db, health, watch, log } = setUp();
    await watch.tick();
    expect(health.status().state).toBe('up');
    db.process = 'gone';
    await watch.tick();
    expect(db.starts).toBe(1);
    expect(health.status()).toMatchObject({ state: 'restarting', restarts: 1, lastRestartAt: new Date(0).toISOString() });
    expect(health.available()).toBe(false);
    await watch.tick();
    expect(health.status().state).toBe('up');
    expect(log.join('\n')).toMatch(/exited; restarting[\s\S]*restarted \(pid 101\)[\s\S]*answering again/);
    await watch.stop();
  });

  it('backs off while the server keeps dying or will not start, and starts again from the first delay once stable', async () => {
    const { db, health, watch, advance } = setUp();
    db.process = 'gone';
    await watch.tick(); // first restart at once
    db.process = 'gone';
    await watch.tick(); // dead again: waits 1000 ms
    expect(db.starts).toBe(1);
    expect(health.status().state).toBe('down');
    advance(999);
    await watch.tick();
    expect(db.starts).toBe(1);
    db.startFails = true;
    advance(1);
    await watch.tick(); // the attempt fails
    expect(health.status()).toMatchObject({ state: 'down', lastProblem: expect.stringMatching(/restart failed/) });
    db.startFails = false;
    advance(4999);
    await watch.tick();
    expect(db.starts).toBe(1);
    advance(1);
    await watch.tick(); // 5000 ms after the failed attempt
    expect(db.starts).toBe(2);
    await watch.tick();
    expect(health.status()).toMatchObject({ state: 'up', restarts: 2 });
    advance(60_000);
    await watch.tick(); // stable: the next death restarts at once again
    db.process = 'gone';
    await watch.tick();
    expect(db.starts).toBe(3);
    await watch.stop();
  });

  it('reports a stopped (SIGSTOP) or silent server as stalled and does not restart it', async () => {
    const { db, health, watch } = setUp();
    db.process = 'stopped';
    await watch.tick();
    expect(health.status()).toMatchObject({ state: 'stalled', lastProblem: expect.stringMatching(/stopped \(SIGSTOP\)/) });
    db.process = 'running';
    db.answers = false;
    await watch.tick();
    await watch.tick();
    // Running again after SIGCONT but still late: the same stall, its cause kept.
    expect(health.status()).toMatchObject({ state: 'stalled', lastProblem: expect.stringMatching(/was stopped \(SIGSTOP\), runs again and gave no answer within 1000 ms, \d+ times in a row/) });
    expect(db.starts).toBe(0);
    db.answers = true;
    await watch.tick();
    expect(health.status()).toMatchObject({ state: 'up', lastProblem: expect.stringMatching(/SIGSTOP/) });
    // A later silence without a stop is reported as silence only.
    db.answers = false;
    for (let i = 0; i < 30; i++) await watch.tick();
    expect(health.status()).toMatchObject({ state: 'stalled', lastProblem: expect.stringMatching(/^the server \(pid \d+\) gave no answer within 1000 ms/) });
    db.answers = true;
    await watch.tick();
    expect(health.status()).toMatchObject({ state: 'up', restarts: 0 });
    await watch.stop();
  });

  it('does not call one late ping on a busy machine an outage', async () => {
    const { db, health, watch } = setUp();
    db.answers = false;
    await watch.tick();
    expect(health.available()).toBe(true);
    db.answers = true;
    await watch.tick();
    db.answers = false;
    await watch.tick();
    expect(health.available()).toBe(true);
    await watch.tick();
    expect(health.status().state).toBe('stalled');
    await watch.stop();
  });

  it('only reports a database it does not supervise', async () => {
    const { db, health, watch } = setUp(false);
    db.process = 'gone';
    await watch.tick();
    expect(health.available()).toBe(true);
    await watch.tick();
    expect(health.status()).toMatchObject({ state: 'unreachable', supervised: false });
    expect(db.starts).toBe(0);
    await watch.stop();
  });
});
