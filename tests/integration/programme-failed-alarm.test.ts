import { afterAll, beforeAll, expect, it } from 'vitest';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { FakeSmtpServer } from '../../server/alarms/fake-smtp.js';
import { FakeBench, type FakePackSpec } from '../../server/control/testing/fake-bench.js';
import { FakeInstrument } from '../../server/control/testing/fake-instrument.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { attachProgrammes } from '../../server/programmes/attach-programmes.js';
import type { ProgrammeInput } from '../../shared/schemas/programme.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

// A made-up 8-cell LFP pack (demo values): 24 V empty to 28 V full, 2 Ah, 20 mΩ; its protection 50 A.
const PACK: FakePackSpec = { emptyVolts: 24, fullVolts: 28, capacityAh: 2, resistanceOhms: 0.02, startSoc: 0.8, tempCelsius: 25 };
const DISCHARGE: ProgrammeInput = {
  name: 'Discharge, 8s LFP, 1 A',
  chemistry: 'lfp',
  cellsInSeries: 8,
  maxCurrentAmps: 50,
  steps: [{ kind: 'discharge', mode: 'cc', value: 1, endVolts: 24.5 }],
};
/** Meter seconds per frame, and real ms between frames. */
const METER_STEP_S = 20;
const FRAME_EVERY_MS = 40;
const FRAMES_BEFORE_SILENCE = 30;

const feed = new ManualFeed();
const smtp = new FakeSmtpServer();
const load = new FakeInstrument('load-1', 'load', () => Date.now());
const supply = new FakeInstrument('supply-1', 'supply', () => Date.now(), false);
let t: TestContext;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let ids: { batteryId: number; benchId: number };

beforeAll(async () => {
  await smtp.start();
  t = await createTestContext({
    config: { alarms: { ...DEFAULT_ALARM_DELIVERY, smtpUrl: smtp.url, publicUrl: 'http://kneepoint.test', retryFirstMs: 200, retryMaxMs: 400 } },
    attachments: [
      liveAttachment({ feed, spillDir: tempSpillDir() }),
      attachAlarms,
      async (server, ctx) => {
        ctx.services.benchInstruments = { forBench: async () => ({ load, supply }) };
        return attachProgrammes(server, ctx);
      },
    ],
  });
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  ids = await batteryAndBench(await signInAs(t, 'admin'), { chemistry: 'lfp', cellsInSeries: 8, ratedAh: 2, bmsRatedAmps: 50 });
});
afterAll(async () => {
  await t?.close();
  await smtp.stop();
});

it('a programme that fails safe raises a critical programme-failed alarm that reaches its subscribers (in-app and e-mail)', async () => {
  await viewer.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: null, kind: 'programme-failed', channel: 'in-app' }] }).expect(200);
  await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: ids.benchId, kind: 'programme-failed', channel: 'email' }] }).expect(200);
  const runId = (await tech.post('/api/runs').send({ ...ids, name: 'meter goes silent', stopWhen: 'manual', kind: 'capacity-discharge' }).expect(201)).body.run.id as number;
  const programme = await tech.post('/api/programmes').send(DISCHARGE).expect(201);
  await tech.post(`/api/runs/${runId}/programme`).send({ programmeId: programme.body.programme.id, acknowledgeCautions: true }).expect(201);
  const bench = new FakeBench(PACK, load, supply);
  for (let i = 0; i < FRAMES_BEFORE_SILENCE; i++) {
    const r = bench.step(METER_STEP_S);
    feed.emit(ids.benchId, { t: 1000 + r.elapsedSeconds, volts: r.volts, amps: r.amps, temps: r.temps, clock: 'device' });
    await new Promise((resolve) => setTimeout(resolve, FRAME_EVERY_MS));
  }
  // The meter stops: the safety net switches the load off and the programme fails safe.
  await eventually(async () => expect(load.outputOn).toBe(false), 5000, 20);
  const failed = await eventually(async () => {
    const alarms = (await viewer.get(`/api/alarms?runId=${runId}`).expect(200)).body.alarms as { id: number; kind: string; priority: string; message: string }[];
    const found = alarms.find((a) => a.kind === 'programme-failed');
    expect(found).toBeDefined();
    return found!;
  });
  expect(failed.priority).toBe('critical');
  expect(failed.message).toMatch(/failed safe at step 1 .*meter silent.*Outputs switched off/);
  await eventually(async () => {
    const inbox = (await viewer.get('/api/alarms/inbox').expect(200)).body.alarms as { id: number }[];
    expect(inbox.map((a) => a.id)).toContain(failed.id);
  });
  await eventually(async () => expect(smtp.received.some((m) => m.to.includes(TEST_USERS.technician.email) && m.subject.includes('programme-failed'))).toBe(true), 10_000);
});
