import { statSync } from 'node:fs';
import { Agent } from 'node:https';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { OutboxMessage } from '../../shared/schemas/alarm.js';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { pushAttachment } from '../../server/push/attach-push.js';
import { VAPID_FILE } from '../../server/push/vapid-keys.js';
import { createTestContext, signInAs, type SignedInAgent, type TestContext } from './helpers/index.js';
import { browserKeys, decrypt, FakePushService, loopbackCertificate } from './push-kit.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const tls = loopbackCertificate();

const feed = new ManualFeed();
const push = new FakePushService(tls);
let t: TestContext;
let tech: SignedInAgent;
let admin: SignedInAgent;
let ids: { batteryId: number; benchId: number };

beforeAll(async () => {
  await push.start();
  t = await createTestContext({
    // A sender address the e-mail channel's address check accepts (the built-in default has no domain dot).
    config: { alarms: { ...DEFAULT_ALARM_DELIVERY, mailFrom: 'alarms@northgate-cell-lab.test' } },
    attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), attachAlarms, pushAttachment({ agent: new Agent({ ca: tls.cert }) })] });
  [tech, admin] = await Promise.all([signInAs(t, 'technician'), signInAs(t, 'admin')]);
  ids = await batteryAndBench(admin, { label: 'Pack N-7', brand: 'Northgate Cells' });
});
afterAll(async () => {
  await t?.close();
  await push.stop();
});

describe('Web Push alarms', () => {
  it('keeps the VAPID keys under the data directory, readable by the owner only, and hands out the public key', async () => {
    const file = join(t.ctx.config.dataDir, VAPID_FILE);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    const key = (await tech.get('/api/push/key').expect(200)).body.publicKey as string;
    // An uncompressed P-256 point is 65 bytes (SEC 1 §2.3.3), starting 0x04.
    expect(Buffer.from(key, 'base64url')).toHaveLength(65);
    expect(Buffer.from(key, 'base64url')[0]).toBe(4);
  });

  it('refuses a malformed subscription and a non-https endpoint with 400', async () => {
    const keys = browserKeys();
    await tech.post('/api/push/subscriptions').send({ endpoint: 'not a url', keys: keys.json }).expect(400);
    await tech.post('/api/push/subscriptions').send({ endpoint: 'http://push.example/x', keys: keys.json }).expect(400);
    await tech.post('/api/push/subscriptions').send({ endpoint: `${push.url}/x`, keys: { p256dh: 'short', auth: keys.json.auth } }).expect(400);
  });

  it('a run to cutoff sends a push within 5 s that decrypts to the e-mail\'s values; Acknowledge by its token records who', async () => {
    const good = browserKeys();
    const gone = browserKeys();
    await tech.post('/api/push/subscriptions').send({ endpoint: `${push.url}/send/tech-1`, keys: good.json }).expect(201);
    await tech.post('/api/push/subscriptions').send({ endpoint: `${push.url}/gone/tech-2`, keys: gone.json }).expect(201);
    await tech.put('/api/alarms/subscriptions').send({
      subscriptions: [{ benchId: null, kind: 'cutoff', channel: 'push' }, { benchId: null, kind: 'cutoff', channel: 'email' }],
    }).expect(200);

    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Push run', stopWhen: 'manual', endVolts: { mode: 'absolute', volts: 10 } }).expect(201)).body.run;
    // A 4-cell LFP pack at 5 A sagging 0.07 V/s from 13.2 V: it crosses the 10 V end voltage near 46 s.
    for (let s = 0; s < 60; s++) feed.emit(ids.benchId, { t: s, volts: 13.2 - 0.07 * s, amps: 5, temps: { cell: 24 }, clock: 'device' });
    const cutoffAtMs = await eventually(async () => {
      const alarms = (await tech.get(`/api/alarms?runId=${run.id}`).expect(200)).body.alarms as { kind: string; raisedAt: string }[];
      const cutoff = alarms.find((a) => a.kind === 'cutoff');
      expect(cutoff).toBeDefined();
      return Date.parse(cutoff!.raisedAt);
    });

    const sent = await eventually(async () => {
      const hit = push.received.find((r) => r.path === '/send/tech-1');
      expect(hit).toBeDefined();
      return hit!;
    }, 5000);
    expect(sent.atMs - cutoffAtMs).toBeLessThan(5000);
    // RFC 8291/8292 headers: aes128gcm content and a VAPID authorization.
    expect(sent.headers['content-encoding']).toBe('aes128gcm');
    expect(sent.headers.authorization).toMatch(/^vapid t=.+, k=.+/);
    const payload = decrypt(sent.body, good);
    expect(payload.kind).toBe('cutoff');
    expect(payload.bench).toMatch(/^Bench /);
    expect(payload.pack).toBe('Northgate Cells Pack N-7');
    expect(payload.runUrl).toMatch(new RegExp(`/runs/${run.id}$`));

    // The same values as the e-mail the same alarm produced (the fake SMTP outbox).
    const mail = await eventually(async () => {
      const messages = (await admin.get('/api/alarms/outbox').expect(200)).body.messages as OutboxMessage[];
      const m = messages.find((x) => x.to.includes('tech@test.lab'));
      expect(m).toBeDefined();
      return m!;
    });
    for (const [label, value] of payload.values) expect(mail.text).toContain(`${label}: ${value}`);
    expect(mail.text).toContain(`Bench: ${payload.bench}`);
    expect(mail.text).toContain(`Pack: ${payload.pack}`);
    expect(mail.text).toContain(payload.runUrl);
    expect(payload.values.map(([k]) => k)).toEqual(['Voltage', 'Current', 'Energy out', 'Charge out', 'Temperature', 'Run time']);

    // The 410 endpoint was removed; the good one stays.
    await eventually(async () => {
      const [rows] = await t.ctx.sequelize.query('SELECT endpoint FROM push_subscriptions');
      expect((rows as { endpoint: string }[]).map((r) => r.endpoint)).toEqual([`${push.url}/send/tech-1`]);
    });

    // A wrong or foreign token is refused; the payload's token acknowledges with no session or CSRF.
    const anonymous = (await import('supertest')).default(t.url);
    await anonymous.post('/api/push/acknowledge').send({ alarmId: payload.alarmId, token: payload.ackToken.replace(/.$/, (c) => (c === 'A' ? 'B' : 'A')) }).expect(403);
    await anonymous.post('/api/push/acknowledge').send({ alarmId: payload.alarmId + 1, token: payload.ackToken }).expect(403);
    const acked = (await anonymous.post('/api/push/acknowledge').send({ alarmId: payload.alarmId, token: payload.ackToken }).expect(200)).body.alarm;
    expect(acked.acknowledgedBy.name).toBe('Test Technician');
    const events = (await tech.get(`/api/runs/${run.id}/events`).expect(200)).body.events as { event: { type: string; by?: string; alarmId?: number } }[];
    // Who and when: the run event carries the acknowledging person and the alarm's own acknowledgement time.
    expect(events.map((e) => e.event)).toContainEqual(expect.objectContaining({ type: 'alarm-ack', alarmId: payload.alarmId, by: 'Test Technician', at: acked.acknowledgedAt }));
  });
});
