import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import { axeViolations } from './helpers/axe.js';
import { launchBrowser, type TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { overflowPx, settle, widestElements } from './helpers/screens.js';
import { signInThroughForm } from './helpers/sign-in.js';

const NASA_CSV = fileURLToPath(new URL('../fixtures/nasa-pcoe-b0005-discharge-cycle1.csv', import.meta.url));
/** A phone in portrait, the size the screens must fit (CSS pixels). */
const PHONE = { width: 390, height: 844 };
const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;
const RUN_NAME = 'Cell B0005 shared discharge';

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;
let runId: number;
let shareUrl: string;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
  const tech = await signInAs(t, 'technician', { email: account('technician').email, password: t.ctx.config.demoPassword });
  const res = await tech.post('/api/runs/import').field('name', RUN_NAME).field('endVolts', '2.7').field('currentSign', 'auto').attach('file', NASA_CSV).expect(201);
  runId = res.body.run.id as number;
});

afterAll(async () => {
  await app?.close();
});

async function signedIn(role: string): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.context.newPage();
  await signInThroughForm(page, t.url, account(role).email, t.ctx.config.demoPassword);
  await page.goto(`${t.url}/runs/${runId}`);
  await page.getByRole('heading', { name: 'Sign-off' }).waitFor();
  return page;
}

describe('sign off a run and open its share link in a fresh browser with no session', () => {
  it('a technician marks the run ready, the lab manager signs it off, the technician makes a link', { timeout: 120_000 }, async () => {
    const tech = await signedIn('technician');
    await tech.getByLabel('Comment for the reviewer (optional)').fill('Imported log, end voltage 2.7 V');
    await tech.getByRole('button', { name: 'Mark ready for review' }).click();
    await tech.getByText("Ready for review: waiting for the lab manager's sign-off.").waitFor();
    expect(await tech.getByRole('button', { name: 'Sign off' }).count()).toBe(0);
    await tech.close();

    const admin = await signedIn('admin');
    await admin.getByLabel('Sign-off comment').fill('Checked against the cell rating');
    await admin.getByRole('button', { name: 'Sign off' }).click();
    await admin.getByText('Signed off.').waitFor();
    const history = admin.getByRole('list', { name: 'Review history' });
    expect(await history.getByRole('listitem').count()).toBe(2);
    await admin.getByLabel('Days the link works').fill('7');
    await admin.getByRole('button', { name: 'Make link' }).click();
    shareUrl = (await admin.getByTestId('share-url').textContent())!.trim();
    expect(shareUrl).toMatch(new RegExp(`^${t.url}/s/[A-Za-z0-9_-]{43}$`));
    await admin.screenshot({ path: `${SCREENSHOT_DIR}/run-signed-off.png`, fullPage: true });
    await admin.close();
  });

  it('opens the signed report in a new browser profile without signing in, readable in both looks and on a phone', { timeout: 120_000 }, async () => {
    const fresh = await launchBrowser();
    try {
      expect(await fresh.context.cookies()).toEqual([]);
      const findings: string[] = [];
      for (const scheme of ['light', 'dark'] as const) {
        const page = await fresh.context.newPage();
        await page.setViewportSize(PHONE);
        await page.emulateMedia({ colorScheme: scheme });
        await page.goto(shareUrl);
        await page.getByRole('heading', { name: RUN_NAME }).waitFor();
        await settle(page);
        expect(page.url()).toBe(shareUrl);
        expect(await page.getByText('Signed off.').isVisible()).toBe(true);
        expect(await page.getByText('Checked against the cell rating').isVisible()).toBe(true);
        expect(await page.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
        expect(await page.evaluate(`document.documentElement.classList.contains('dark')`)).toBe(scheme === 'dark');
        for (const v of await axeViolations(page)) findings.push(`${scheme} ${v.rule} ${v.targets.join(' ')} ${v.summary}`);
        const overflow = await overflowPx(page);
        if (overflow > 0) findings.push(`${scheme} overflows 390 px by ${overflow}: ${(await widestElements(page)).join(', ')}`);
        await page.screenshot({ path: `${SCREENSHOT_DIR}/shared-run-${scheme}.png`, fullPage: true });
        await page.close();
      }
      expect(findings).toEqual([]);
      // The fresh browser still holds no session: it saw the report without one.
      expect((await fresh.context.cookies()).filter((c) => c.name === 'kneepoint.sid')).toEqual([]);
    } finally {
      await fresh.close();
    }
  });

  it('opens a shared pack report (specs, capacity history, inspection thumbnails) with no session, readable in both looks and on a phone', { timeout: 120_000 }, async () => {
    const tech = await signInAs(t, 'technician', { email: account('technician').email, password: t.ctx.config.demoPassword });
    const pack = await tech.post('/api/batteries').send({ label: 'Pack NG-7', brand: 'Corvane', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 2, price: 120, priceCurrency: 'EUR' }).expect(201);
    const packId = pack.body.battery.id as number;
    await tech.put(`/api/batteries/${packId}/runs/${runId}`).expect(200);
    const picture = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#5a6470' } }).jpeg().toBuffer();
    await tech.post(`/api/batteries/${packId}/photos`).attach('file', picture, 'welds.jpg').expect(201);
    const { token } = (await tech.post('/api/share-links').send({ kind: 'battery', targetId: packId }).expect(201)).body as { token: string };
    const fresh = await launchBrowser();
    try {
      const findings: string[] = [];
      for (const scheme of ['light', 'dark'] as const) {
        const page = await fresh.context.newPage();
        await page.setViewportSize(PHONE);
        await page.emulateMedia({ colorScheme: scheme });
        await page.goto(`${t.url}/s/${token}`);
        await page.getByRole('heading', { name: /Pack NG-7/ }).waitFor();
        await settle(page);
        expect(await page.getByRole('cell', { name: RUN_NAME }).isVisible()).toBe(true);
        // The thumbnail loads through the token; the price was not chosen, so it is not shown.
        const img = page.getByRole('img', { name: /Inspection photo/ }).first();
        await img.waitFor();
        // Thumbnails load lazily: bring it into view as a reader scrolling down would.
        await img.scrollIntoViewIfNeeded();
        await expect.poll(() => img.evaluate((el) => (el as unknown as { naturalWidth: number }).naturalWidth)).toBeGreaterThan(0);
        expect(await page.getByText('Price').count()).toBe(0);
        for (const v of await axeViolations(page)) findings.push(`${scheme} ${v.rule} ${v.targets.join(' ')} ${v.summary}`);
        const overflow = await overflowPx(page);
        if (overflow > 0) findings.push(`${scheme} overflows 390 px by ${overflow}: ${(await widestElements(page)).join(', ')}`);
        await page.screenshot({ path: `${SCREENSHOT_DIR}/shared-pack-${scheme}.png`, fullPage: true });
        await page.close();
      }
      expect(findings).toEqual([]);
    } finally {
      await fresh.close();
    }
  });

  it('shows "not available" and nothing of the run once the link is revoked', { timeout: 60_000 }, async () => {
    const admin = await signedIn('admin');
    await admin.getByRole('list', { name: 'Share links' }).getByRole('button', { name: 'Revoke' }).click();
    await admin.getByRole('list', { name: 'Share links' }).getByText(/revoked/).waitFor();
    await admin.close();
    const fresh = await launchBrowser();
    try {
      const page = await fresh.context.newPage();
      await page.goto(shareUrl);
      await page.getByRole('heading', { name: 'Report not available' }).waitFor();
      expect(await page.getByText(RUN_NAME).count()).toBe(0);
    } finally {
      await fresh.close();
    }
  });
});
