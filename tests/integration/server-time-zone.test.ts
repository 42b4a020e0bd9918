import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { RunResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const feed = new ManualFeed();
const MINUTE_MS = 60_000;
let t: TestContext;
let tech: SignedInAgent;
let zoneBefore: string | undefined;
beforeAll(async () => {
  // A lab server left in its local zone (this file's process only): stored times must still be UTC.
  zoneBefore = process.env.TZ;
  process.env.TZ = 'America/Chicago';
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() })] });
  tech = await signInAs(t, 'technician');
});
afterAll(async () => {
  await t?.close();
  if (zoneBefore === undefined) delete process.env.TZ;
  else process.env.TZ = zoneBefore;
});

describe('a server not running in UTC', () => {
  it('stores and answers a run\'s start and end at the real instant, not shifted by its offset', async () => {
    const ids = await batteryAndBench(await signInAs(t, 'admin'));
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Zone check', stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s < 3; s++) feed.emit(ids.benchId, { t: s, volts: 13, amps: 2, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await eventually(async () => {
      const stored = RunResponseSchema.parse((await tech.get(`/api/runs/${run.id}`).expect(200)).body).run;
      expect(stored.state).toBe('finished');
      expect(Math.abs(Date.parse(stored.startedAt!) - Date.now())).toBeLessThan(MINUTE_MS);
      expect(Math.abs(Date.parse(stored.endedAt!) - Date.now())).toBeLessThan(MINUTE_MS);
    });
  });
});
