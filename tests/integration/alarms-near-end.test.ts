import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { FakeSmtpServer } from '../../server/alarms/fake-smtp.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

// A constant-power discharge of a 4-cell LFP pack rated 10 Ah: 4 × 3.2 V (LFP nominal, common
// practice) × 10 Ah = 128 Wh rated. At 12.8 V × 10 A = 128 W (P = V·I) the rated energy lasts
// 3600 s, so at run second t the time to the end voltage is (3600 − t)/60 min (E = P·t), which
// falls under the lab's 15 minutes after t = 2700 s.
const VOLTS = 12.8;
const AMPS = 10;
const NEAR_END_MINUTES = 15;
const UNDER_LIMIT_AFTER_S = 2700;
const LAST_S = 2900;
const END_VOLTS = 10;

const feed = new ManualFeed();
const smtp = new FakeSmtpServer();
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;

beforeAll(async () => {
  await smtp.start();
  t = await createTestContext({
    config: { alarms: { ...DEFAULT_ALARM_DELIVERY, smtpUrl: smtp.url, mailFrom: 'alarms@northgate-cell-lab.test', retryFirstMs: 200, retryMaxMs: 400 } },
    attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), attachAlarms],
  });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
  await admin.put('/api/alarms/settings').send({ escalateAfterMinutes: 10, sourceLostSeconds: 3600, nearEndMinutes: NEAR_END_MINUTES }).expect(200);
  await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: null, kind: 'near-end', channel: 'email' }] }).expect(200);
  // The alarm service reads the lab's settings on its timer: wait for the turn that takes the 15 minutes.
  await new Promise((r) => setTimeout(r, 1500));
});
afterAll(async () => {
  await t?.close();
  await smtp.stop();
});

/** Starts a run on a fresh bench with the 128 Wh pack, feeds a 10 A discharge at these volts to LAST_S, returns the run id. */
async function discharge(voltsAt: (s: number) => number, name: string): Promise<number> {
  const pack = { label: 'Rated pack', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 10 };
  const ids = await batteryAndBench(admin, pack);
  // No near-end voltage margin on the run: the only way to a near-end alarm is the live estimate.
  const run = (await tech.post('/api/runs').send({ ...ids, name, endVolts: { mode: 'absolute', volts: END_VOLTS }, stopWhen: 'manual' }).expect(201)).body.run;
  for (let s = 0; s <= LAST_S; s++) feed.emit(ids.benchId, { t: s, volts: voltsAt(s), amps: AMPS, temps: { cell: 25 }, clock: 'device' });
  await t.ctx.services.alarms!.settle();
  return run.id as number;
}

const alarmsOf = async (runId: number) => (await tech.get(`/api/alarms?runId=${runId}`).expect(200)).body.alarms as { kind: string; elapsedSeconds: number; message: string; id: number }[];

describe('the near-end alarm from the live time to the end voltage', () => {
  it('fires once, through the recorder, at the reading where the estimate drops under the lab\'s minutes', async () => {
    const runId = await discharge(() => VOLTS, 'Near end by estimate');
    const nearEnd = (await alarmsOf(runId)).filter((a) => a.kind === 'near-end');
    expect(nearEnd).toHaveLength(1);
    // The first reading with (3600 − t)/60 < 15 is the one after 2700 s.
    expect(nearEnd[0]!.elapsedSeconds).toBeGreaterThan(UNDER_LIMIT_AFTER_S);
    expect(nearEnd[0]!.elapsedSeconds).toBeLessThanOrEqual(UNDER_LIMIT_AFTER_S + 1);
    expect(nearEnd[0]!.message).toBe('About 15 min to the end voltage');
    // Exactly one mail for it, although every later reading is also under the limit.
    await eventually(async () => expect(smtp.received.filter((m) => m.subject.includes('near-end'))).toHaveLength(1));
    await new Promise((r) => setTimeout(r, 1000));
    expect(smtp.received.filter((m) => m.subject.includes('near-end') && m.to.includes(TEST_USERS.technician.email))).toHaveLength(1);
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
  });

  it('does not fire when the estimate is unavailable (the voltage rising under load)', async () => {
    // A pack warming under load: 12 V rising 0.5 mV/s, faster than the estimator's 0.2 mV/s
    // "rising" limit, so it shows no time to the end voltage. By 2900 s about 102 Wh of the
    // 128 Wh are out (∫ V·I dt), so a falling voltage would have fired: the estimate decides.
    const runId = await discharge((s) => 12 + 0.0005 * s, 'No estimate');
    expect((await alarmsOf(runId)).filter((a) => a.kind === 'near-end')).toEqual([]);
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
    await t.ctx.services.alarms!.settle();
    expect((await alarmsOf(runId)).map((a) => a.kind)).toEqual(['run-finished']);
  });
});
