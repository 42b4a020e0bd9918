import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PushPayload } from '../../shared/schemas/push.js';
import { AlarmRepo } from '../../server/alarms/alarm-repo.js';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { makeAckToken } from '../../server/push/ack-token.js';
import { signInAs } from '../integration/helpers/index.js';
import type { TestContext } from '../integration/helpers/index.js';
import { eventually } from '../integration/runs-kit.js';
import type { TestBrowser } from './helpers/browser.js';
import { startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

// Headless Chromium has no push service to subscribe with, but the DevTools protocol can hand
// a push message straight to a registered service worker (ServiceWorker.deliverPushMessage):
// that runs the built /alarm-sw.js in a real browser, as a push service's message would.
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;
const HOUR_MS = 3_600_000;

let app: E2eApp;
let t: TestContext;
let browser: TestBrowser;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
});
afterAll(async () => {
  await app?.close();
});

interface ShownNotification { title: string; tag: string; renotify: boolean; actions: string[]; data: { alarmId?: number; step?: number } | null }

describe('the alarm service worker in Chromium', () => {
  it('shows a pushed alarm with Acknowledge, replaces a repeat and a reminder in place, and its token acknowledges from the browser with no cookie', { timeout: 90_000 }, async () => {
    const tech = account('technician');
    const password = t.ctx.config.demoPassword;
    // A run to hang an alarm on (a bench with no source: nothing else happens to it).
    const admin = await signInAs(t, 'admin', { email: account('admin').email, password });
    const techApi = await signInAs(t, 'technician', { email: tech.email, password });
    const battery = (await admin.get('/api/batteries').expect(200)).body.batteries[0];
    const bench = (await admin.post('/api/benches').send({ name: 'Push drill bench', source: { kind: 'none' } }).expect(201)).body.bench;
    const run = (await techApi.post('/api/runs').send({ benchId: bench.id, batteryId: battery.id, name: 'Push drill', stopWhen: 'manual' }).expect(201)).body.run;
    const alarm = await new AlarmRepo(t.ctx.sequelize).insert({
      runId: run.id, benchId: bench.id, kind: 'cutoff', priority: 'critical', message: 'End voltage reached: cutoff at 10.000 V', elapsedSeconds: 60,
      values: { volts: 10, amps: 5, dischargeWh: 40, dischargeAh: 3.5, tempCelsius: 25, runSeconds: 60 }, shelved: false, raisedAt: new Date(), nextEscalationAt: null,
    });

    const page = await browser.context.newPage();
    await browser.context.grantPermissions(['notifications'], { origin: t.url });
    await signInThroughForm(page, t.url, tech.email, password);
    await page.goto(`${t.url}/alarms`);
    const cdp = await browser.context.newCDPSession(page);
    const registrationId = new Promise<string>((resolve) => {
      cdp.on('ServiceWorker.workerRegistrationUpdated', (e: { registrations: { registrationId: string; scopeURL: string; isDeleted: boolean }[] }) => {
        const found = e.registrations.find((r) => !r.isDeleted && r.scopeURL.startsWith(t.url));
        if (found) resolve(found.registrationId);
      });
    });
    await cdp.send('ServiceWorker.enable');
    await page.evaluate(`navigator.serviceWorker.register('/alarm-sw.js').then(() => navigator.serviceWorker.ready).then(() => true)`);

    const payload = (step: number): PushPayload => ({
      alarmId: alarm.id, step, kind: 'cutoff', priority: 'critical', title: `CRITICAL cutoff: ${bench.name}`, body: `End voltage reached${step ? ` (reminder ${step}, not yet acknowledged)` : ''}`,
      bench: bench.name, pack: `${battery.brand} ${battery.label}`, run: `Push drill (#${run.id})`, values: [['Voltage', '10.000 V']],
      runUrl: `${t.url}/runs/${run.id}`, ackUrl: `${t.url}/alarms/${alarm.id}`, ackApiUrl: `${t.url}/api/push/acknowledge`,
      ackToken: makeAckToken(t.ctx.services.push!.ackSecret, { alarmId: alarm.id, userId: techApi.user.id, expiresAtMs: Date.now() + HOUR_MS }),
    });
    const deliver = async (p: PushPayload) => cdp.send('ServiceWorker.deliverPushMessage', { origin: t.url, registrationId: await registrationId, data: JSON.stringify(p) });
    const shown = () => page.evaluate(`navigator.serviceWorker.ready.then((r) => r.getNotifications()).then((ns) => ns.map((n) => ({ title: n.title, tag: n.tag, renotify: n.renotify, actions: n.actions.map((a) => a.title), data: n.data })))`) as Promise<ShownNotification[]>;

    await deliver(payload(0));
    // On a busy machine the worker can still be starting when the first push is handed over, and
    // Chromium then drops it; a push service delivers again, so this does too (a repeat of the
    // same step replaces the notification, as checked below).
    const [first] = await eventually(async () => {
      let list = await shown();
      if (list.length === 0) {
        await deliver(payload(0));
        await new Promise((ok) => setTimeout(ok, 500));
        list = await shown();
      }
      expect(list).toHaveLength(1);
      return list;
    }, 30_000, 200);
    expect(first).toMatchObject({ title: `CRITICAL cutoff: ${bench.name}`, tag: `alarm-${alarm.id}`, renotify: false, actions: ['Acknowledge', 'Open the run'], data: { alarmId: alarm.id, step: 0 } });
    // The same step again (a server sends at least once): still one notification, not alerting again.
    await deliver(payload(0));
    const repeat = await shown();
    expect(repeat).toHaveLength(1);
    expect(repeat[0]).toMatchObject({ renotify: false, data: { step: 0 } });
    // A reminder replaces it in place and alerts again.
    await deliver(payload(1));
    await eventually(async () => expect((await shown()).map((n) => [n.data?.step, n.renotify])).toEqual([[1, true]]));

    // The Acknowledge action's request, as the worker sends it: the token, no cookie, from the browser.
    const token = payload(1).ackToken;
    const status = await page.evaluate(`fetch('/api/push/acknowledge', { method: 'POST', credentials: 'omit', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ alarmId: ${alarm.id}, token: '${token}' }) }).then((r) => r.status)`);
    expect(status).toBe(200);
    const events = (await techApi.get(`/api/runs/${run.id}/events`).expect(200)).body.events as { event: { type: string; by?: string } }[];
    expect(events.map((e) => e.event)).toContainEqual(expect.objectContaining({ type: 'alarm-ack', alarmId: alarm.id, by: tech.name }));
    await techApi.post(`/api/runs/${run.id}/stop`).send({}).expect(200);
    await page.close();
  });
});
