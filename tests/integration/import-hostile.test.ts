import { writeFile, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ImportResponseSchema, ListRunsResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';

let t: TestContext;
let tech: SignedInAgent;
let dir: string;
beforeAll(async () => {
  t = await createTestContext();
  tech = await signInAs(t, 'technician');
  dir = await mkdtemp(join(tmpdir(), 'kp-import-hostile-'));
});
afterAll(async () => {
  await t?.close();
  await rm(dir, { recursive: true, force: true });
});

async function upload(name: string, content: string | Buffer) {
  const path = join(dir, name);
  await writeFile(path, content);
  return tech.post('/api/runs/import').field('name', name).attach('file', path);
}
const total = async () => (await tech.get('/api/runs').expect(200)).body.total as number;
// Ten rows one second apart at a constant current: Ah = amps × 9 s / 3600 (constant-current arithmetic).
const rows = (sep: string, dec: (n: number) => string, amps: string) =>
  Array.from({ length: 10 }, (_, i) => [String(i), dec(13 - i / 100), amps].join(sep)).join('\n');

describe('import: odd and hostile files', () => {
  it('refuses a file without line breaks at once (400 naming line 1), without reading it whole', async () => {
    const before = await total();
    const started = Date.now();
    const res = await upload('no-lines.csv', Buffer.alloc(4 * 1024 * 1024, 0x41));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^line 1: longer than \d+ bytes/);
    expect(Date.now() - started).toBeLessThan(5000);
    expect(await total()).toBe(before);
  });

  it('refuses rows whose time goes back, naming the line (the integrator would drop them quietly)', async () => {
    const before = await total();
    const res = await upload('backwards.csv', 'time,volts,amps\n0,13,5\n1,12.9,5\n2,12.8,5\n1,12.7,5\n3,12.6,5\n');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^line 5: time goes back/);
    expect(await total()).toBe(before);
  });

  it('refuses numbers a logger would not write (hex), naming the line and column', async () => {
    const res = await upload('hex.csv', 'time,volts,amps\n0,13,5\n1,0x0d,5\n2,12.8,5\n');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('line 3: volts "0x0d" is not a number');
  });

  it('imports a semicolon-separated log with decimal commas, and a tab-separated one', async () => {
    const semi = await upload('semi.csv', `time;volts;amps\n${rows(';', (n) => String(n).replace('.', ','), '5,5')}\n`);
    expect(semi.status).toBe(201);
    const s = ImportResponseSchema.parse(semi.body).summary;
    expect(s.rows).toBe(10);
    expect(s.dischargeAh).toBeCloseTo((5.5 * 9) / 3600, 12);
    const tab = await upload('tab.csv', `time\tvolts\tamps\n${rows('\t', String, '5')}\n`);
    expect(tab.status).toBe(201);
    expect(ImportResponseSchema.parse(tab.body).summary.dischargeAh).toBeCloseTo((5 * 9) / 3600, 12);
  });

  it('a header with no data says what is wrong with the header first', async () => {
    const res = await upload('words.csv', 'hello world\n');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^line 1: no time, volts, amps column recognised/);
  });
});

describe('import: tags', () => {
  const csv = 'time,volts,amps\n0,13,5\n1,12.9,5\n';
  const withTags = async (tags: string) => {
    const path = join(dir, 'tags.csv');
    await writeFile(path, csv);
    return tech.post('/api/runs/import').field('name', 'Tagged').field('tags', tags).attach('file', path);
  };

  it('refuses more tags, or longer ones, than a rename allows, so the run list stays valid for every client', async () => {
    const before = await total();
    const many = await withTags(Array.from({ length: 31 }, (_, i) => `t${i}`).join(','));
    expect(many.status).toBe(400);
    expect(many.body.error.fields).toHaveProperty('tags');
    expect((await withTags('y'.repeat(51))).status).toBe(400);
    expect(await total()).toBe(before);
    expect((await withTags(' acceptance , lfp ,,')).body.run.tags).toEqual(['acceptance', 'lfp']);
    ListRunsResponseSchema.parse((await tech.get('/api/runs').expect(200)).body);
  });
});

describe('import: timestamps without a zone', () => {
  it('reads them in the lab time zone, so the run starts at the right instant', async () => {
    const admin = await signInAs(t, 'admin');
    await admin.patch('/api/settings').send({ timeZone: 'Europe/Berlin' }).expect(200);
    try {
      const lines = Array.from({ length: 5 }, (_, i) => `2026-07-15 12:00:0${i},${13 - i / 100},5`).join('\n');
      const res = await upload('local-times.csv', `timestamp,volts,amps\n${lines}\n`);
      expect(res.status).toBe(201);
      const body = ImportResponseSchema.parse(res.body);
      // Berlin is UTC+2 in July (EU summer time, from memory): 12:00 local is 10:00 UTC.
      expect(body.run.startedAt).toBe('2026-07-15T10:00:00.000Z');
      expect(body.summary.durationSeconds).toBe(4);
    } finally {
      await admin.patch('/api/settings').send({ timeZone: 'UTC' }).expect(200);
    }
  });
});
