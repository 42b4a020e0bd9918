import { createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { QueryTypes, type Sequelize } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRun, type ImportRequest } from '../../server/runs/import-service.js';
import { RunsRepo } from '../../server/runs/runs-repo.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let tech: SignedInAgent;
let dir: string;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  dir = await mkdtemp(join(tmpdir(), 'kp-import-failure-'));
});
afterAll(async () => {
  await t?.close();
  await rm(dir, { recursive: true, force: true });
});

/** A log long enough for several groups of archive blocks (each group is one 1 MiB read of the file). */
async function writeLog(path: string, rows: number): Promise<void> {
  const out = createWriteStream(path);
  out.write('time_s,voltage_v,current_a\n');
  for (let i = 0; i < rows; i += 10_000) {
    let chunk = '';
    for (let j = i; j < Math.min(rows, i + 10_000); j++) chunk += `${j},${(13.3 - j * 1e-6).toFixed(6)},4\n`;
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
}

/** The app's Sequelize, except that the `failAt`-th transaction fails as a lost database would. */
function failingAt(sequelize: Sequelize, failAt: number): { sequelize: Sequelize; transactions: () => number } {
  let count = 0;
  const proxy = new Proxy(sequelize, {
    get(target, key, receiver) {
      if (key === 'transaction') {
        return (...args: unknown[]) => {
          count++;
          if (count === failAt) return Promise.reject(new Error('connection lost (test)'));
          return (target.transaction as (...a: unknown[]) => unknown).apply(target, args);
        };
      }
      const value = Reflect.get(target, key, receiver) as unknown;
      return typeof value === 'function' ? (value as (...a: unknown[]) => unknown).bind(target) : value;
    },
  });
  return { sequelize: proxy, transactions: () => count };
}

describe('an import that fails half-way', () => {
  it('leaves nothing of itself and loses nothing already recorded', async () => {
    const path = join(dir, 'half.csv');
    // 200,000 rows of about 20 bytes: 4 MB, so four groups of blocks and a failure in the second.
    await writeLog(path, 200_000);
    const kept = await tech.post('/api/runs/import').field('name', 'kept before').attach('file', path).expect(201);
    const keptId = kept.body.run.id as number;
    const chunksOf = async (runId: number) =>
      (await t.ctx.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM run_reading_chunks WHERE runId = ?', { replacements: [runId], type: QueryTypes.SELECT }))[0]!.n;
    const keptChunks = Number(await chunksOf(keptId));
    expect(keptChunks).toBeGreaterThan(0);
    const runsBefore = (await tech.get('/api/runs')).body.total as number;

    const { sequelize, transactions } = failingAt(t.ctx.sequelize, 2);
    const req: ImportRequest = {
      filePath: path, name: 'fails half-way', tags: [], battery: null, currentSign: 'auto', columns: {}, userId: tech.user.id, timeZone: 'UTC', acceptancePercent: 95,
    };
    await expect(importRun(sequelize, new RunsRepo(t.ctx.sequelize), req)).rejects.toThrow('connection lost (test)');
    expect(transactions()).toBeGreaterThanOrEqual(2);

    const names = ((await tech.get('/api/runs')).body.runs as { name: string }[]).map((r) => r.name);
    expect(names).not.toContain('fails half-way');
    expect((await tech.get('/api/runs')).body.total).toBe(runsBefore);
    const orphans = await t.ctx.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM run_reading_chunks c LEFT JOIN runs r ON r.id = c.runId WHERE r.id IS NULL', { type: QueryTypes.SELECT });
    expect(Number(orphans[0]!.n)).toBe(0);
    expect(Number(await chunksOf(keptId))).toBe(keptChunks);
    const samples = (await tech.get(`/api/runs/${keptId}/readings?maxPoints=1000`).expect(200)).body;
    expect(samples.readingsInWindow).toBe(200_000);
  }, 120_000);
});

describe('the import pass', () => {
  it('gives the same run whether the check pass kept the rows or the file is read again', async () => {
    const path = join(dir, 'twice.csv');
    await writeLog(path, 50_000);
    const repo = new RunsRepo(t.ctx.sequelize);
    const base: ImportRequest = {
      filePath: path, name: 'kept rows', tags: [], battery: null, currentSign: 'auto', columns: {}, userId: tech.user.id, timeZone: 'UTC', acceptancePercent: 95,
    };
    const kept = await importRun(t.ctx.sequelize, repo, base);
    const reread = await importRun(t.ctx.sequelize, repo, { ...base, name: 'read again', maxKeptRows: 1000 });
    expect(reread.summary).toEqual(kept.summary);
    expect(reread.fullSummary).toEqual(kept.fullSummary);
    expect([kept.run.readingsCount, reread.run.readingsCount]).toEqual([50_000, 50_000]);
    const samples = async (id: number) => ({ ...(await tech.get(`/api/runs/${id}/readings?maxPoints=500`).expect(200)).body, runId: undefined });
    expect(await samples(reread.run.id)).toEqual(await samples(kept.run.id));
  }, 120_000);
});
