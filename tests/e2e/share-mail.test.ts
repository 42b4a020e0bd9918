import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import { eventually } from '../integration/runs-kit.js';
import { launchBrowser, type TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

const CLIENT = 'buyer@client-firm.test';
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;

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

describe('a share link sent by e-mail', () => {
  it('a technician e-mails a pack report link from the share panel; the client opens it from the mail with no account', { timeout: 120_000 }, async () => {
    const tech = account('technician');
    const password = t.ctx.config.demoPassword;
    const admin = await signInAs(t, 'admin', { email: account('admin').email, password });
    const pack = (await admin.get('/api/batteries').expect(200)).body.batteries[0] as { id: number; label: string };

    const page = await browser.context.newPage();
    await signInThroughForm(page, t.url, tech.email, password);
    await page.goto(`${t.url}/batteries/${pack.id}`);
    await page.getByLabel('Days the link works').fill('14');
    await page.getByRole('button', { name: 'Make link' }).click();
    const form = page.getByRole('form', { name: 'Send the link by e-mail' });
    await form.getByLabel("Client's e-mail address").fill(CLIENT);
    await form.getByLabel('Message (optional)').fill('Hello,\nthe capacity report for your pack is ready.');
    await form.getByRole('button', { name: 'Send by e-mail' }).click();
    await form.getByText(`Queued: the e-mail to ${CLIENT} goes out within seconds.`).waitFor();
    // The link's entry follows the queue until the mail went out.
    await page.getByRole('list', { name: 'E-mails of this link' }).getByText(new RegExp(`E-mailed to ${CLIENT.replace('.', '\\.')} .*: sent$`)).waitFor({ timeout: 20_000 });
    await page.screenshot({ path: `${SCREENSHOT_DIR}/share-by-email.png`, fullPage: true });
    await page.close();

    // The demo's local fake SMTP server keeps the mail in the admin's outbox.
    const mail = await eventually(async () => {
      const messages = (await admin.get('/api/alarms/outbox').expect(200)).body.messages as { to: string[]; subject: string; text: string }[];
      const found = messages.find((m) => m.to.includes(CLIENT));
      expect(found).toBeDefined();
      return found!;
    }, 20_000, 250);
    expect(mail.subject).toContain(`${tech.name} shared a report with you`);
    expect(mail.text).toContain('> the capacity report for your pack is ready.');
    const link = /Open the report \(read-only, no account needed\): (\S+)/.exec(mail.text)![1]!;
    expect(link).toMatch(new RegExp(`^${t.url}/s/[A-Za-z0-9_-]{43}$`));

    const client = await launchBrowser();
    try {
      const view = await client.context.newPage();
      await view.goto(link);
      await view.getByRole('heading', { name: new RegExp(pack.label.replace(/[#]/g, '\\$&')) }).first().waitFor();
      expect(view.url()).toBe(link);
      expect(await view.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
      expect((await client.context.cookies()).filter((c) => c.name === 'kneepoint.sid')).toEqual([]);
      await view.screenshot({ path: `${SCREENSHOT_DIR}/shared-pack-from-mail.png`, fullPage: true });
    } finally {
      await client.close();
    }
    const links = (await admin.get(`/api/share-links?kind=battery&targetId=${pack.id}`).expect(200)).body.links as { id: number; openings: number }[];
    expect(links[0]!.openings).toBe(1);
  });
});
