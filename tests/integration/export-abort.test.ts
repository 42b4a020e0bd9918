import { Writable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { liveAttachment } from '../../server/live/attach-live.js';
import { batteryLookup } from '../../server/runs/battery-facts.js';
import { exportMeta } from '../../server/runs/export-meta.js';
import { streamCsvExport, streamJsonExport } from '../../server/runs/export-stream.js';
import { RunResponseSchema } from '../../shared/schemas/api-runs.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const feed = new ManualFeed();
const READINGS = 5000;
let t: TestContext;
let tech: SignedInAgent;
let runId: number;
beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() })] });
  tech = await signInAs(t, 'technician');
  const ids = await batteryAndBench(await signInAs(t, 'admin'));
  runId = (await tech.post('/api/runs').send({ ...ids, name: 'Export abort', stopWhen: 'manual' }).expect(201)).body.run.id;
  for (let s = 0; s < READINGS; s++) feed.emit(ids.benchId, { t: s, volts: 13, amps: 2, clock: 'device' });
  await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
  await eventually(async () => expect(RunResponseSchema.parse((await tech.get(`/api/runs/${runId}`)).body).run.readingsCount).toBe(READINGS));
});
afterAll(() => t?.close());

/** A client that stops reading after the first bytes, then hangs up. */
function stalledClient(): Writable {
  const out = new Writable({ highWaterMark: 16, write: () => undefined });
  return out;
}
const within = <T>(p: Promise<T>, ms: number) =>
  Promise.race([p.then(() => 'ended' as const), new Promise<'hung'>((r) => setTimeout(() => r('hung'), ms))]);

describe('an export whose client hangs up mid-stream', () => {
  for (const [name, stream] of [['csv', streamCsvExport], ['json', streamJsonExport]] as const) {
    it(`ends (${name}) instead of waiting for ever for the socket to drain`, async () => {
      const meta = await exportMeta(t.ctx.sequelize, RunResponseSchema.parse((await tech.get(`/api/runs/${runId}`)).body).run, batteryLookup(t.ctx));
      const out = stalledClient();
      const done = stream(out, t.ctx.sequelize, meta);
      await new Promise((r) => setTimeout(r, 100));
      out.destroy();
      expect(await within(done, 3000)).toBe('ended');
    });
  }
});
