import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import type { TestContext } from '../integration/helpers/index.js';
import { launchBrowser, type TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

/** The demo scenario's two-hour discharge plays in about 25 s at this speed. */
const SIMULATOR_SPEED = 300;
const CUTOFF_WAIT_MS = 75_000;
/** Generous: browsers and builds share two cores here; the 5 s mail target is checked in tests/integration/push-alarms.test.ts. */
const MAIL_WAIT_MS = 30_000;
const SCENARIO = 'lfp-12v-100ah-cp-cutoff';
const RUN_NAME = 'Alarm drill 600 W';
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
});
afterAll(async () => {
  await app?.close();
});

describe('alarms that reach people away from the bench', () => {
  it('a technician subscribes (in the app and by e-mail), a run cuts off, the mail is in the outbox, its link acknowledges after sign-in, the run says who', { timeout: 150_000 }, async () => {
    const page = await browser.context.newPage();
    const tech = account('technician');
    const admin = account('admin');

    // Admin: the simulated bench at high speed.
    await signInThroughForm(page, t.url, admin.email, t.ctx.config.demoPassword);
    const benches = (await page.evaluate(`fetch('/api/benches').then((r) => r.json())`)) as { benches: { id: number; source: { scenario?: string } }[] };
    const bench = benches.benches.find((b) => b.source.scenario === SCENARIO)!;
    await page.goto(`${t.url}/benches/${bench.id}`);
    await page.getByRole('link', { name: 'Set up bench' }).click();
    await page.getByLabel('Speed (× real time)').fill(String(SIMULATOR_SPEED));
    await page.getByRole('button', { name: 'Save bench' }).click();
    await page.waitForURL(/\/benches\/\d+$/);
    const benchUrl = page.url();

    // Technician: a cutoff on every bench, in the app and by e-mail.
    await browser.context.clearCookies();
    await signInThroughForm(page, t.url, tech.email, t.ctx.config.demoPassword);
    await page.goto(`${t.url}/alarms`);
    // Loopback is a secure context, so the push control is offered (subscribing needs the browser's push service; see the report).
    await page.getByTestId('push-browser').getByRole('button', { name: 'Notify this browser' }).waitFor();
    // The demo pack's protection opens before the end voltage, so both kinds of cutoff.
    for (const kind of ['Cutoff (end voltage)', 'Protection trip']) {
      for (const channel of ['In the app', 'E-mail']) {
        await page.getByRole('button', { name: 'Add' }).click();
        const row = page.getByRole('group', { name: /Subscription \d+/ }).last();
        await row.getByLabel('Alarm').selectOption({ label: kind });
        await row.getByLabel('By').selectOption({ label: channel });
      }
    }
    await page.getByRole('button', { name: 'Save my alarms' }).click();
    await page.getByText('Saved.').waitFor();
    const saved = (await page.evaluate(`fetch('/api/alarms/subscriptions').then((r) => r.json())`)) as { subscriptions: { kind: string; channel: string }[] };
    expect(saved.subscriptions.map((s) => `${s.kind} ${s.channel}`).sort()).toEqual(['cutoff email', 'cutoff in-app', 'protection-trip email', 'protection-trip in-app']);

    // The run to cutoff.
    await page.goto(benchUrl);
    const form = page.getByRole('form', { name: 'Start a run' });
    await form.waitFor();
    const packPicker = form.getByLabel('Battery pack');
    const pack = await packPicker.locator('option', { hasText: ' 4S ' }).first().getAttribute('value');
    await packPicker.selectOption(pack!);
    await form.getByLabel('Run name').fill(RUN_NAME);
    await form.getByRole('button', { name: 'Arm the run' }).click();
    await page.getByRole('heading', { name: RUN_NAME }).waitFor();
    await page.getByRole('alert').filter({ hasText: 'CUTOFF' }).waitFor({ timeout: CUTOFF_WAIT_MS });
    const cutoffSeenMs = Date.now();

    // The mail, read by the admin in the app's outbox (the local fake SMTP server's), in a second browser.
    const second = await launchBrowser();
    try {
      const adminPage = await second.context.newPage();
      await signInThroughForm(adminPage, t.url, admin.email, t.ctx.config.demoPassword);
      await adminPage.goto(`${t.url}/alarms`);
      const outbox = adminPage.getByRole('heading', { name: /Outbox/ }).locator('..');
      // Each try reloads the page and waits for the outbox to load before counting (a count taken
      // straight after the reload sees the page before its data and would never find the mail).
      await expect.poll(async () => {
        await adminPage.reload();
        await outbox.waitFor();
        return outbox.getByText(/CRITICAL (cutoff|protection-trip)/).first().waitFor({ timeout: 3000 }).then(() => 1, () => 0);
      }, { timeout: MAIL_WAIT_MS }).toBeGreaterThan(0);
      console.log(`[figure] alarm mail in the outbox ${Date.now() - cutoffSeenMs} ms after the banner showed the cutoff`);
      expect(await outbox.textContent()).toContain(tech.email);
      await adminPage.screenshot({ path: `${SCREENSHOT_DIR}/alarms-outbox.png`, fullPage: true });

      // The technician, on another device with no session, follows the mail's Acknowledge link:
      // sign-in first, then the alarm's page, where Acknowledge records them.
      const messages = (await adminPage.evaluate(`fetch('/api/alarms/outbox').then((r) => r.json())`)) as { messages: { to: string[]; subject: string; text: string }[] };
      const mail = messages.messages.find((m) => m.to.includes(tech.email) && /CRITICAL (cutoff|protection-trip)/.test(m.subject))!;
      const ackUrl = /Acknowledge \(sign in first\): (\S+)/.exec(mail.text)![1]!;
      expect(ackUrl).toMatch(new RegExp(`^${t.url}/alarms/\\d+$`));
      await second.context.clearCookies();
      const phone = await second.context.newPage();
      await phone.goto(ackUrl);
      await phone.waitForURL(/\/sign-in\?next=/);
      await phone.getByLabel('E-mail').fill(tech.email);
      await phone.getByLabel('Password').fill(t.ctx.config.demoPassword);
      await phone.getByRole('button', { name: 'Sign in' }).click();
      await phone.waitForURL(ackUrl);
      await phone.getByRole('button', { name: 'Acknowledge' }).click();
      await phone.getByText(`acknowledged by ${tech.name}`, { exact: false }).waitFor({ timeout: 10_000 });
      await phone.screenshot({ path: `${SCREENSHOT_DIR}/alarm-acknowledged-from-mail.png`, fullPage: true });
    } finally {
      await second.close();
    }

    // Recorded on the run with who, shown live on the technician's bench page.
    await page.getByRole('list', { name: 'Run events' }).getByText(new RegExp(`acknowledged by ${tech.name}`)).waitFor({ timeout: 10_000 });
    await page.screenshot({ path: `${SCREENSHOT_DIR}/alarm-acknowledged.png`, fullPage: true });
    await page.close();
  });
});
