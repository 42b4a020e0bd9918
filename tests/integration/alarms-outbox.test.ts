import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutboxMessageSchema } from '../../shared/schemas/alarm.js';
import { attachAlarms } from '../../server/compose/alarms-root.js';
import { liveAttachment } from '../../server/live/attach-live.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { batteryAndBench, eventually, ManualFeed, tempSpillDir } from './runs-kit.js';

const feed = new ManualFeed();
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;

// No KNEEPOINT_SMTP_URL (config.alarms unset): outside production the server runs its own fake SMTP server.
beforeAll(async () => {
  t = await createTestContext({ attachments: [liveAttachment({ feed, spillDir: tempSpillDir() }), attachAlarms] });
  admin = await signInAs(t, 'admin');
  tech = await signInAs(t, 'technician');
});
afterAll(() => t?.close());

describe('the local fake SMTP server and the outbox', () => {
  it('listens on loopback only, and an alarm mail it receives is in the admin\'s outbox', async () => {
    const fake = t.ctx.services.fakeSmtp!;
    expect(fake.url).toMatch(/^smtp:\/\/127\.0\.0\.1:\d+$/);
    const ids = await batteryAndBench(admin);
    await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: ids.benchId, kind: 'run-finished', channel: 'email' }] }).expect(200);
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Outbox run', stopWhen: 'manual' }).expect(201)).body.run;
    for (let s = 0; s <= 5; s++) feed.emit(ids.benchId, { t: s, volts: 13, amps: 2, clock: 'device' });
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    const messages = await eventually(async () => {
      const body = (await admin.get('/api/alarms/outbox').expect(200)).body;
      expect(body.messages).toHaveLength(1);
      return body.messages.map((m: unknown) => OutboxMessageSchema.parse(m));
    });
    expect(messages[0].to).toEqual([TEST_USERS.technician.email]);
    expect(messages[0].subject).toContain('run-finished');
    expect(messages[0].text).toContain(`/runs/${run.id}`);
    expect(messages[0].html).toContain('Open the run');
    await tech.get('/api/alarms/outbox').expect(403);
  });

  it('raises source-lost after the lab\'s silence limit without data, and clears it when data comes again', async () => {
    const ids = await batteryAndBench(admin);
    await admin.put('/api/alarms/settings').send({ escalateAfterMinutes: 10, sourceLostSeconds: 5, nearEndMinutes: 15 }).expect(200);
    await tech.put('/api/alarms/subscriptions').send({ subscriptions: [{ benchId: ids.benchId, kind: 'source-lost', channel: 'in-app' }] }).expect(200);
    const run = (await tech.post('/api/runs').send({ ...ids, name: 'Silent meter', stopWhen: 'manual' }).expect(201)).body.run;
    feed.emit(ids.benchId, { t: 0, volts: 13, amps: 2, clock: 'device' });
    const silentAtMs = Date.now();
    const lost = await eventually(async () => {
      const alarms = (await tech.get(`/api/alarms?runId=${run.id}`).expect(200)).body.alarms;
      expect(alarms.map((a: { kind: string }) => a.kind)).toContain('source-lost');
      return alarms.find((a: { kind: string }) => a.kind === 'source-lost');
    }, 15_000, 250);
    // Not before the limit (5 s), and within the watchdog's one-second tick after it.
    expect(Date.parse(lost.raisedAt) - silentAtMs).toBeGreaterThanOrEqual(5000 - 50);
    expect(lost).toMatchObject({ state: 'unacknowledged', priority: 'warning' });
    expect((await tech.get('/api/alarms/inbox').expect(200)).body.alarms.map((a: { id: number }) => a.id)).toContain(lost.id);
    feed.emit(ids.benchId, { t: 6, volts: 13, amps: 2, clock: 'device' });
    await eventually(async () => expect((await tech.get(`/api/alarms/${lost.id}`).expect(200)).body.alarm.state).toBe('cleared-unacknowledged'));
    await tech.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
  });
});
