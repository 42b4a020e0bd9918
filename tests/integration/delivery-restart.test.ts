import { Agent } from 'node:https';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AlarmChannels, type AlarmChannel } from '../../server/alarms/alarm-channel.js';
import { AlarmRepo } from '../../server/alarms/alarm-repo.js';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { DeliveryQueue, IN_DOUBT_ERROR } from '../../server/alarms/delivery-queue.js';
import { DELIVERY_LEASE_MS, DeliveryWorker } from '../../server/alarms/delivery-worker.js';
import { createSmtpTransport, emailChannel } from '../../server/alarms/email-channel.js';
import { FakeSmtpServer } from '../../server/alarms/fake-smtp.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { pushAttachment } from '../../server/push/attach-push.js';
import { pushTopic } from '../../server/push/push-channel.js';
import { startServer, type RunningServer } from '../../server/server.js';
import { getLabSettings } from '../../server/settings/settings-service.js';
import { createTestContext, dropTestDatabase, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { browserKeys, decrypt, FakePushService, loopbackCertificate } from './push-kit.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';
import { quietLogger } from '../../server/log/logger.js';

const MAIL_FROM = 'alarms@northgate-cell-lab.test';
const alarmsConfig = { ...DEFAULT_ALARM_DELIVERY, mailFrom: MAIL_FROM, retryFirstMs: 200, retryMaxMs: 400, maxAttempts: 100 };
/** How much of its lease the "dead" server's claim has left when the test starts the next server. */
const LEASE_LEFT_MS = 2500;
/** Service Unavailable: the push service is down for that browser for now (RFC 9110 §15.6.4). */
const UNAVAILABLE = 503;

const tls = loopbackCertificate();
const push = new FakePushService(tls);
const smtp = new FakeSmtpServer();
const feed = new ManualFeed();
let t: TestContext;
/** The server now running (the first is t's; each restart replaces it). */
let current: { ctx: RunningServer['ctx']; url: string; close: () => Promise<void> };
const restarted: RunningServer[] = [];
let admin: SignedInAgent;
let tech: SignedInAgent;
let runId: number;

const attachments = () => [liveAttachment({ feed: new ManualFeed(), spillDir: tempSpillDir() }), attachAlarms, pushAttachment({ agent: new Agent({ ca: tls.cert }) })];

/** Stops the running server and starts another on the same database, as a restart does. */
async function restart(): Promise<void> {
  await current.close();
  const next = await startServer({
    config: t.ctx.config, database: { ...t.ctx.config.db }, port: 0, attachments: attachments(),
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  });
  restarted.push(next);
  current = { ctx: next.ctx, url: next.url, close: () => next.close() };
  [admin, tech] = await Promise.all([signInAs({ url: next.url }, 'admin'), signInAs({ url: next.url }, 'technician')]);
}

const deliveries = async () => (await admin.get('/api/alarms/deliveries').expect(200)).body.deliveries as { id: number; alarmId: number; userId: number; channel: string; status: string; attempts: number; lastError: string | null }[];

beforeAll(async () => {
  await Promise.all([push.start(), smtp.start()]);
  t = await createTestContext({
    config: { alarms: { ...alarmsConfig, smtpUrl: smtp.url } },
    attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), attachAlarms, pushAttachment({ agent: new Agent({ ca: tls.cert }) })],
  });
  current = { ctx: t.ctx, url: t.url, close: () => t.server.close() };
  [admin, tech] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician')]);
});
afterAll(async () => {
  for (const s of restarted) await s.close();
  if (restarted.length > 0) await dropTestDatabase(t.databaseName);
  else await t?.close();
  await Promise.all([push.stop(), smtp.stop()]);
});

describe('delivery without duplicates after a restart', () => {
  it('push: one browser\'s push service down, a restart, then up: each browser gets the alarm exactly once', async () => {
    const phone = browserKeys();
    const laptop = browserKeys();
    await tech.post('/api/push/subscriptions').send({ endpoint: `${push.url}/send/phone`, keys: phone.json }).expect(201);
    await tech.post('/api/push/subscriptions').send({ endpoint: `${push.url}/send/laptop`, keys: laptop.json }).expect(201);
    await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: null, kind: 'cutoff', channel: 'push' }] }).expect(200);
    push.statusFor = (path) => (path === '/send/laptop' ? UNAVAILABLE : 201);

    const ids = await batteryAndBench(admin);
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Restart drill', endVolts: { mode: 'absolute', volts: 12 }, stopWhen: 'manual' }).expect(201)).body.run;
    runId = run.id;
    for (let s = 0; s <= 40; s++) feed.emit(ids.benchId, { t: s, volts: 13.2 - 0.05 * s, amps: 10, clock: 'device' });
    const hits = (path: string, status?: number) => push.received.filter((r) => r.path === path && (status === undefined || r.status === status));
    // The phone has it; the laptop's service has refused it at least twice (the queue retries).
    await eventually(async () => {
      expect(hits('/send/phone')).toHaveLength(1);
      expect(hits('/send/laptop', UNAVAILABLE).length).toBeGreaterThanOrEqual(2);
    });

    await restart();
    push.statusFor = () => 201;
    await eventually(async () => expect(hits('/send/laptop', 201)).toHaveLength(1));
    await new Promise((r) => setTimeout(r, 1500));
    expect(hits('/send/phone')).toHaveLength(1);
    expect(hits('/send/laptop', 201)).toHaveLength(1);
    const row = (await deliveries()).find((d) => d.channel === 'push')!;
    expect(row).toMatchObject({ status: 'sent', lastError: null });
    // Every try carried the same Topic, so a push service holding an earlier copy replaces it.
    expect(new Set([...hits('/send/phone'), ...hits('/send/laptop')].map((r) => r.headers.topic))).toEqual(new Set([pushTopic(row.alarmId, 0)]));
    const payload = decrypt(hits('/send/laptop', 201)[0]!.body, laptop);
    expect(payload).toMatchObject({ alarmId: row.alarmId, step: 0, kind: 'cutoff' });
  });

  it('mail: a server that stops between the SMTP server\'s acceptance and the "sent" mark leaves the row to go again after the lease, with the same Message-ID, noted as in doubt', async () => {
    const { sequelize } = current.ctx;
    const repo = new AlarmRepo(sequelize);
    const queue = new DeliveryQueue(sequelize, { firstMs: 200, maxMs: 400, maxAttempts: 100 });
    // This server's worker is down while the doomed one works, as if on another machine.
    await current.ctx.services.alarmDelivery!.stop();
    const alarm = await repo.insert({
      runId, benchId: null, kind: 'run-finished', priority: 'info', message: 'Run finished', elapsedSeconds: 40,
      values: { volts: null, amps: null, dischargeWh: null, dischargeAh: null, tempCelsius: null, runSeconds: 40 }, shelved: false, raisedAt: new Date(), nextEscalationAt: null,
    });
    // The doomed server's clock puts its claim's lease end LEASE_LEFT_MS from now.
    const doomedNowMs = () => Date.now() - DELIVERY_LEASE_MS + LEASE_LEFT_MS;
    await queue.enqueue([{ alarmId: alarm.id, userId: admin.user.id, channel: 'email', step: 0 }], new Date(doomedNowMs()));
    let handedOver = false;
    const email = emailChannel(createSmtpTransport({ url: smtp.url, requireTls: false, from: MAIL_FROM }), MAIL_FROM);
    // Hands the mail to SMTP, then never returns: the process died before marking the row.
    const dies: AlarmChannel = { name: 'email', deliver: async (d) => {
      await email.deliver(d);
      handedOver = true;
      await new Promise<never>(() => {});
    } };
    const channels = new AlarmChannels();
    channels.register(dies);
    const doomed = new DeliveryWorker({
      queue, repo, channels, labSettings: () => getLabSettings(current.ctx.models), publicUrl: () => 'http://kneepoint.test', nowMs: doomedNowMs, log: quietLogger,
    });
    doomed.kick();
    const mails = () => smtp.received.filter((m) => m.to.includes(TEST_USERS.admin.email) && m.subject.includes('run-finished'));
    await eventually(async () => expect(handedOver).toBe(true));
    expect(mails()).toHaveLength(1);
    const inFlight = (await deliveries()).find((d) => d.alarmId === alarm.id)!;
    expect(inFlight).toMatchObject({ status: 'pending', attempts: 1, lastError: null });

    await restart();
    // Not while the dead server's lease runs: nobody can know whether it finished.
    await new Promise((r) => setTimeout(r, LEASE_LEFT_MS / 2));
    expect(mails()).toHaveLength(1);
    await eventually(async () => expect(mails()).toHaveLength(2), 10_000);
    const messageId = (raw: string) => /^Message-ID:\s*(<[^>]+>)/im.exec(raw)?.[1];
    expect(messageId(mails()[0]!.raw)).toBe(`<alarm-delivery-${inFlight.id}@kneepoint.invalid>`);
    expect(messageId(mails()[1]!.raw)).toBe(messageId(mails()[0]!.raw));
    await eventually(async () => expect((await deliveries()).find((d) => d.id === inFlight.id)).toMatchObject({ status: 'sent', attempts: 2, lastError: IN_DOUBT_ERROR }));
  });
});
