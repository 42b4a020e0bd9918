import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AlarmSchema } from '../../shared/schemas/alarm.js';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { FakeSmtpServer, type ReceivedMail } from '../../server/alarms/fake-smtp.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { createTestContext, dropTestDatabase, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, sessionCookie, tempSpillDir, WsProbe } from './runs-kit.js';

// A linear discharge: V(t) = V0 − b·t at a constant current. The end voltage is crossed at
// T = (V0 − Vend)/b = 1200 s; closed forms (calculus, common practice): Ah = I·T/3600 = 3.33…,
// Wh = I·(V0·T − b·T²/2)/3600 = 10·(15 840 − 720)/3600 = 42.0.
const V0 = 13.2;
const SLOPE_V_PER_S = 0.001;
const AMPS = 10;
const END_VOLTS = 12;
const CROSSING_S = 1200;
const CELL_C = 25;
const volts = (s: number) => V0 - SLOPE_V_PER_S * s;
/** The promise: the mail is in the fake SMTP within 5 s of the event. */
const MAIL_WITHIN_MS = 5000;
const PUBLIC_URL = 'http://kneepoint.test';

const feed = new ManualFeed();
const smtp = new FakeSmtpServer();
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let ids: { batteryId: number; benchId: number };
let runId: number;
let cutoffAlarmId: number;
const extraServers: RunningServer[] = [];
const probes: WsProbe[] = [];

const mailsTo = (address: string, pred: (m: ReceivedMail) => boolean = () => true) => smtp.received.filter((m) => m.to.includes(address) && pred(m));
const userId = async (agent: SignedInAgent) => agent.user.id;
const alarmsConfig = { ...DEFAULT_ALARM_DELIVERY, publicUrl: PUBLIC_URL, retryFirstMs: 200, retryMaxMs: 400, maxAttempts: 100 };

beforeAll(async () => {
  await smtp.start();
  t = await createTestContext({
    config: { alarms: { ...alarmsConfig, smtpUrl: smtp.url } },
    attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), attachAlarms],
  });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
  viewer = await signInAs(t, 'viewer');
  ids = await batteryAndBench(admin, { label: 'Cell Stack 7', brand: 'Voltara' });
});
afterAll(async () => {
  for (const p of probes) p.close();
  for (const s of extraServers) await s.close();
  if (extraServers.length > 0) await dropTestDatabase(t.databaseName);
  else await t?.close();
  await smtp.stop();
});

describe('subscriptions', () => {
  it('a viewer manages only their own subscriptions; a user id in the body is refused', async () => {
    await viewer.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: null, kind: 'run-finished', channel: 'in-app' }] }).expect(200);
    await tech.put('/api/alarms/subscriptions').send({
      subscriptions: [
        { benchId: ids.benchId, kind: 'cutoff', channel: 'email' },
        { benchId: null, kind: 'run-finished', channel: 'email' },
        { benchId: null, kind: 'near-end', channel: 'email' },
      ],
    }).expect(200);
    expect((await viewer.get('/api/alarms/subscriptions').expect(200)).body.subscriptions).toEqual([{ benchId: null, kind: 'run-finished', channel: 'in-app' }]);
    expect((await tech.get('/api/alarms/subscriptions').expect(200)).body.subscriptions).toHaveLength(3);
    // Naming someone else is not a way in: the schema is strict and the user is the session's.
    const other = await viewer.put('/api/alarms/subscriptions').send({ userId: await userId(tech), subscriptions: [] }).expect(400);
    expect(other.body.error.message).toMatch(/invalid/i);
    await viewer.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: ids.benchId, kind: 'cutoff', channel: 'email', userId: 1 }] }).expect(400);
    expect((await tech.get('/api/alarms/subscriptions').expect(200)).body.subscriptions).toHaveLength(3);
    await viewer.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: 999_999, kind: 'cutoff', channel: 'email' }] }).expect(400);
    await viewer.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: null, kind: 'meltdown', channel: 'email' }] }).expect(400);
  });

  it('only an admin sets an on-call list, shelves a kind (logged) and reads the outbox', async () => {
    const onCall = [await userId(admin), await userId(viewer)];
    await tech.put(`/api/alarms/on-call/${ids.benchId}`).send({ userIds: onCall }).expect(403);
    await admin.put(`/api/alarms/on-call/${ids.benchId}`).send({ userIds: [onCall[0], onCall[0]] }).expect(400);
    const set = await admin.put(`/api/alarms/on-call/${ids.benchId}`).send({ userIds: onCall }).expect(200);
    expect(set.body.onCall.map((o: { userId: number }) => o.userId)).toEqual(onCall);
    await tech.post('/api/alarms/shelves').send({ benchId: ids.benchId, kind: 'near-end', minutes: 30, reason: 'margin set too wide' }).expect(403);
    await admin.post('/api/alarms/shelves').send({ benchId: ids.benchId, kind: 'near-end', minutes: 30, reason: 'bad\u0000' }).expect(400);
    const shelf = (await admin.post('/api/alarms/shelves').send({ benchId: ids.benchId, kind: 'near-end', minutes: 30, reason: 'margin set too wide' }).expect(201)).body.shelf;
    expect(shelf).toMatchObject({ kind: 'near-end', reason: 'margin set too wide', shelvedBy: { name: TEST_USERS.admin.name }, endedAt: null });
    expect(Date.parse(shelf.until) - Date.parse(shelf.shelvedAt)).toBe(30 * 60_000);
    await tech.get('/api/alarms/outbox').expect(403);
  });
});

describe('a run to cutoff', () => {
  it('puts an e-mail with the values at the event in the SMTP server within 5 s', async () => {
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Capacity 7', endVolts: { mode: 'absolute', volts: END_VOLTS }, stopWhen: 'manual' }).expect(201)).body.run;
    runId = run.id;
    const startedMs = Date.now();
    for (let s = 0; s <= CROSSING_S + 10; s++) feed.emit(ids.benchId, { t: s, volts: volts(s), amps: AMPS, temps: { cell: CELL_C }, clock: 'device' });
    const [mail] = await eventually(async () => {
      const found = mailsTo(TEST_USERS.technician.email, (m) => m.subject.includes('cutoff'));
      expect(found).toHaveLength(1);
      return found;
    }, MAIL_WITHIN_MS, 50);
    // The last frame (and so the crossing) went in before startedMs + the loop; the mail followed within the limit.
    expect(mail!.receivedAt.getTime() - startedMs).toBeLessThan(MAIL_WITHIN_MS);
    expect(mail!.subject).toContain('Bench');
    expect(mail!.subject).toContain('Voltara Cell Stack 7');
    for (const value of ['12.000 V', '10.00 A', '42.0 Wh', '3.33 Ah', '25.0 °C', '20 min 00 s']) {
      expect(mail!.text).toContain(value);
      expect(mail!.html).toContain(value);
    }
    expect(mail!.text).toContain(`${PUBLIC_URL}/runs/${runId}`);
    const alarms = (await viewer.get(`/api/alarms?runId=${runId}`).expect(200)).body.alarms.map((a: unknown) => AlarmSchema.parse(a));
    const cutoff = alarms.find((a: { kind: string }) => a.kind === 'cutoff')!;
    expect(cutoff).toMatchObject({ priority: 'critical', state: 'unacknowledged', escalationStep: 0 });
    expect(cutoff.values.volts).toBeCloseTo(END_VOLTS, 9);
    expect(cutoff.values.dischargeWh).toBeCloseTo(42, 9);
    expect(cutoff.elapsedSeconds).toBeCloseTo(CROSSING_S, 6);
    expect(mail!.text).toContain(`${PUBLIC_URL}/alarms/${cutoff.id}`);
    cutoffAlarmId = cutoff.id;
    // The first on-call person (the admin) is told at once, in the app and by mail.
    await eventually(async () => expect(mailsTo(TEST_USERS.admin.email, (m) => m.subject.includes('cutoff'))).toHaveLength(1));
    // The near-end milestone was shelved on this bench: recorded, nobody told (the technician subscribed to it).
    await t.ctx.services.alarms!.settle();
    const nearEnd = alarms.find((a: { kind: string }) => a.kind === 'near-end');
    expect(nearEnd).toMatchObject({ shelved: true, priority: 'warning' });
    expect(smtp.received.filter((m) => m.subject.includes('near-end'))).toHaveLength(0);
    expect((await admin.get(`/api/alarms/deliveries?alarmId=${nearEnd.id}`).expect(200)).body.deliveries).toEqual([]);
  });

  it('latches: the pack coming back above the end voltage does not clear the cutoff alarm', async () => {
    for (let s = CROSSING_S + 11; s <= CROSSING_S + 40; s++) feed.emit(ids.benchId, { t: s, volts: 13.1, amps: 0, temps: { cell: CELL_C }, clock: 'device' });
    await t.ctx.services.alarms!.settle();
    const alarm = (await viewer.get(`/api/alarms/${cutoffAlarmId}`).expect(200)).body.alarm;
    expect(alarm.state).toBe('unacknowledged');
    expect(alarm.clearedAt).toBeNull();
  });

  it('escalates while unacknowledged: again to the same people, then to the next on call; acknowledging stops it everywhere and shows who and when live', async () => {
    const service = t.ctx.services.alarms!;
    const due = () => t.ctx.sequelize.query(`UPDATE alarms SET nextEscalationAt = UTC_TIMESTAMP(3) - INTERVAL 1 SECOND WHERE id = ${cutoffAlarmId}`);
    await due();
    await service.escalateDue(60_000);
    await eventually(async () => expect(mailsTo(TEST_USERS.technician.email, (m) => m.subject.includes('reminder 1'))).toHaveLength(1));
    expect(mailsTo(TEST_USERS.viewer.email)).toHaveLength(0);
    await due();
    await service.escalateDue(60_000);
    await eventually(async () => expect(mailsTo(TEST_USERS.viewer.email, (m) => m.subject.includes('reminder 2'))).toHaveLength(1));
    expect((await viewer.get(`/api/alarms/inbox`).expect(200)).body.alarms.map((a: { id: number }) => a.id)).toContain(cutoffAlarmId);

    const probe = await WsProbe.open(t, await sessionCookie(t, 'viewer'));
    probes.push(probe);
    probe.send({ type: 'subscribe', topic: { kind: 'run', id: runId } });
    await probe.next('snapshot');
    await viewer.post(`/api/alarms/${cutoffAlarmId}/acknowledge`).send({}).expect(403);
    const acked = (await tech.post(`/api/alarms/${cutoffAlarmId}/acknowledge`).send({}).expect(200)).body.alarm;
    expect(acked).toMatchObject({ state: 'cleared', acknowledgedBy: { name: TEST_USERS.technician.name } });
    const live = await probe.next('event', (e) => e.event.type === 'alarm-ack');
    expect(live.event).toMatchObject({ type: 'alarm-ack', alarmId: cutoffAlarmId, code: 'cutoff', by: TEST_USERS.technician.name, at: acked.acknowledgedAt });
    const stored = (await viewer.get(`/api/runs/${runId}/events`).expect(200)).body.events.map((e: { event: { type: string } }) => e.event);
    expect(stored.filter((e: { type: string }) => e.type === 'alarm-ack')).toHaveLength(1);
    // A second acknowledge changes nothing and records nothing.
    await tech.post(`/api/alarms/${cutoffAlarmId}/acknowledge`).send({}).expect(200);
    // Even with its next step made due, an acknowledged alarm is not sent again.
    const before = smtp.received.length;
    await due();
    await service.escalateDue(60_000);
    await new Promise((r) => setTimeout(r, 1000));
    expect(smtp.received.length).toBe(before);
    expect((await viewer.get(`/api/runs/${runId}/events`).expect(200)).body.events.filter((e: { event: { type: string } }) => e.event.type === 'alarm-ack')).toHaveLength(1);
  });
});

describe('durable delivery', () => {
  it('SMTP down, then a restart, then SMTP up: the mail goes out exactly once (two servers claim from one queue)', async () => {
    await smtp.stop();
    await tech.post(`/api/runs/${runId}/stop`).send({}).expect(200);
    const finished = await eventually(async () => {
      const rows = (await admin.get('/api/alarms/deliveries').expect(200)).body.deliveries.filter((d: { channel: string; attempts: number }) => d.channel === 'email' && d.attempts >= 2);
      expect(rows).toHaveLength(1);
      return rows[0];
    });
    expect(finished).toMatchObject({ status: 'pending', sentAt: null });
    expect(finished.lastError).toBeTruthy();
    // The viewer's in-app subscription to run-finished is in their list already.
    const inbox = (await viewer.get('/api/alarms/inbox').expect(200)).body.alarms;
    expect(inbox.some((a: { kind: string; runId: number }) => a.kind === 'run-finished' && a.runId === runId)).toBe(true);

    const database = { ...t.ctx.config.db };
    await t.server.close();
    for (let i = 0; i < 2; i++)
      extraServers.push(await startServer({
        config: t.ctx.config, database, port: 0,
        attachments: [liveAttachment({ feed: new ManualFeed(), spillDir: tempSpillDir() }), attachAlarms],
        log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
      }));
    await smtp.start();
    await eventually(async () => expect(mailsTo(TEST_USERS.technician.email, (m) => m.subject.includes('run-finished'))).toHaveLength(1));
    await new Promise((r) => setTimeout(r, 1500));
    expect(mailsTo(TEST_USERS.technician.email, (m) => m.subject.includes('run-finished'))).toHaveLength(1);
    const after = await signInAs({ url: extraServers[0]!.url }, 'admin');
    const row = (await after.get('/api/alarms/deliveries').expect(200)).body.deliveries.find((d: { id: number }) => d.id === finished.id);
    expect(row).toMatchObject({ status: 'sent', lastError: null });
    expect(row.attempts).toBeGreaterThanOrEqual(3);
  });
});
