import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { alarmsAttachment, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { ALARM_TICK_MS } from '../../server/alarms/alarm-service.js';
import { FakeSmtpServer, type ReceivedMail } from '../../server/alarms/fake-smtp.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';
import { MS_PER_MINUTE } from '../../shared/units/time.js';

/** The lab's escalation setting under test: re-send after 1 minute without an acknowledgement. */
const ESCALATE_AFTER_MINUTES = 1;
/** A few timer turns: long enough for the production timer to have acted if it were going to. */
const QUIET_MS = 4 * ALARM_TICK_MS;

// The alarm service and the delivery worker run their own timers (the production scheduler);
// only their clock is moved on, so a minute of escalation takes no minute of test time.
let offsetMs = 0;
const nowMs = () => Date.now() + offsetMs;
const advance = (ms: number) => void (offsetMs += ms);

const feed = new ManualFeed();
const smtp = new FakeSmtpServer();
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;

const cutoffMails = (email: string, pred: (m: ReceivedMail) => boolean = () => true) =>
  smtp.received.filter((m) => m.to.includes(email) && m.subject.includes('cutoff') && pred(m));
const reminder = (step: number) => (m: ReceivedMail) => m.subject.includes(`reminder ${step},`);
const count = (email: string) => cutoffMails(email).length;

beforeAll(async () => {
  await smtp.start();
  t = await createTestContext({
    config: { alarms: { ...DEFAULT_ALARM_DELIVERY, smtpUrl: smtp.url, mailFrom: 'alarms@northgate-cell-lab.test', retryFirstMs: 200, retryMaxMs: 400 } },
    attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), alarmsAttachment({ nowMs })],
  });
  [admin, tech, viewer] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician'), signInAs(t, 'viewer')]);
});
afterAll(async () => {
  await t?.close();
  await smtp.stop();
});

describe('escalation by the alarm timer', () => {
  it('re-sends an unacknowledged cutoff after the lab\'s minutes, then calls the next on-call person; acknowledging stops it', async () => {
    const ids = await batteryAndBench(admin);
    // The source-lost watchdog shares the clock: a long limit keeps it out of this test.
    await admin.put('/api/alarms/settings').send({ escalateAfterMinutes: ESCALATE_AFTER_MINUTES, sourceLostSeconds: 3600, nearEndMinutes: 1 }).expect(200);
    await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: ids.benchId, kind: 'cutoff', channel: 'email' }] }).expect(200);
    const onCall = [admin.user.id, viewer.user.id, tech.user.id];
    await admin.put(`/api/alarms/on-call/${ids.benchId}`).send({ userIds: onCall }).expect(200);

    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Escalation drill', endVolts: { mode: 'absolute', volts: 12 }, stopWhen: 'manual' }).expect(201)).body.run;
    // 13.2 V falling 0.05 V/s at 10 A crosses the 12 V end voltage at 24 s.
    for (let s = 0; s <= 40; s++) feed.emit(ids.benchId, { t: s, volts: 13.2 - 0.05 * s, amps: 10, temps: { cell: 25 }, clock: 'device' });
    // First notice: the subscriber and the first on-call person.
    await eventually(async () => {
      expect(count(TEST_USERS.technician.email)).toBe(1);
      expect(count(TEST_USERS.admin.email)).toBe(1);
    });
    const alarmId = ((await tech.get(`/api/alarms?runId=${run.id}`).expect(200)).body.alarms as { id: number; kind: string }[]).find((a) => a.kind === 'cutoff')!.id;

    // Half the setting: nothing yet.
    advance(ESCALATE_AFTER_MINUTES * MS_PER_MINUTE / 2);
    await new Promise((r) => setTimeout(r, QUIET_MS));
    expect(smtp.received.filter(reminder(1))).toHaveLength(0);

    // The full setting: step 1 goes again to everyone told at first, nobody new.
    advance(ESCALATE_AFTER_MINUTES * MS_PER_MINUTE / 2 + 1000);
    await eventually(async () => {
      expect(cutoffMails(TEST_USERS.technician.email, reminder(1))).toHaveLength(1);
      expect(cutoffMails(TEST_USERS.admin.email, reminder(1))).toHaveLength(1);
    });
    expect(count(TEST_USERS.viewer.email)).toBe(0);
    expect((await viewer.get('/api/alarms/inbox').expect(200)).body.alarms).toEqual([]);

    // Another N minutes: step 2 calls the second on-call person (the viewer), in the app and by mail.
    advance(ESCALATE_AFTER_MINUTES * MS_PER_MINUTE);
    await eventually(async () => expect(cutoffMails(TEST_USERS.viewer.email, reminder(2))).toHaveLength(1));
    expect((await viewer.get('/api/alarms/inbox').expect(200)).body.alarms.map((a: { id: number }) => a.id)).toEqual([alarmId]);
    expect((await tech.get(`/api/alarms/${alarmId}`).expect(200)).body.alarm.escalationStep).toBe(2);

    // Acknowledged: the timer sends nothing more, however long it runs.
    const acked = (await tech.post(`/api/alarms/${alarmId}/acknowledge`).send({}).expect(200)).body.alarm;
    expect(acked.acknowledgedBy.name).toBe(TEST_USERS.technician.name);
    const before = smtp.received.length;
    advance(5 * ESCALATE_AFTER_MINUTES * MS_PER_MINUTE);
    await new Promise((r) => setTimeout(r, QUIET_MS));
    expect(smtp.received.length).toBe(before);
    expect((await tech.get(`/api/alarms/${alarmId}`).expect(200)).body.alarm.escalationStep).toBe(2);
    const events = (await tech.get(`/api/runs/${run.id}/events`).expect(200)).body.events as { event: { type: string; by?: string; at?: string } }[];
    expect(events.map((e) => e.event).filter((e) => e.type === 'alarm-ack')).toEqual([expect.objectContaining({ by: TEST_USERS.technician.name, at: acked.acknowledgedAt })]);
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
  });
});
