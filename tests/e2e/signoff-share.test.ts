import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import { pdfImageCount, pdfText } from '../integration/helpers/pdf-text.js';
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

/** Clicks a download link and gives the downloaded file, after checking it is a PDF. */
async function downloadedPdf(page: Page, linkName: string): Promise<Buffer> {
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: linkName }).click()]);
  const bytes = await readFile((await download.path())!);
  expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  return bytes;
}

/** The text of a downloaded PDF. */
const downloadedPdfText = async (page: Page, linkName: string) => pdfText(await downloadedPdf(page, linkName));

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
    // The report the lab manager downloads carries the signature.
    const signedPdf = await downloadedPdfText(admin, 'Report PDF');
    expect(signedPdf).toContain(`Run report: ${RUN_NAME}`);
    expect(signedPdf).toContain('Signed: the figures below are the ones signed off.');
    expect(signedPdf).toMatch(/Signed by .+ \(admin\), \d{4}-\d\d-\d\d \d\d:\d\d \(/);
    expect(signedPdf).toContain('Comment: Checked against the cell rating');
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
      // The client downloads the signed report's PDF through the link, and reaches nothing else of the lab.
      const page = await fresh.context.newPage();
      await page.goto(shareUrl);
      await page.getByRole('heading', { name: RUN_NAME }).waitFor();
      const pdf = await downloadedPdfText(page, 'Download PDF');
      expect(pdf).toContain(`Run report: ${RUN_NAME}`);
      expect(pdf).toContain('Comment: Checked against the cell rating');
      const token = shareUrl.split('/s/')[1]!;
      const statusOf = async (path: string) => (await page.request.get(`${t.url}${path}`)).status();
      for (const path of ['/api/runs', `/api/runs/${runId}`, `/api/runs/${runId}/report.pdf`, `/api/runs/${runId}/readings`, '/api/batteries', '/api/benches', '/api/settings', '/api/auth/me']) {
        expect([path, await statusOf(path)]).toEqual([path, 401]);
      }
      for (const path of [`/api/shared/${token}/runs`, `/api/shared/${token}/photos/1/thumb`, `/api/shared/${token}/../runs/${runId}`]) {
        const status = await statusOf(path);
        expect([path, status === 401 || status === 404]).toEqual([path, true]);
      }
      await page.close();
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
      // The pack's PDF through the link: its capacity history names the run, the photo is embedded, no price.
      const page = await fresh.context.newPage();
      await page.goto(`${t.url}/s/${token}`);
      await page.getByRole('heading', { name: /Pack NG-7/ }).waitFor();
      const pdf = await downloadedPdf(page, 'Download PDF');
      const text = await pdfText(pdf);
      expect(text).toContain('Pack report: Pack NG-7');
      expect(text).toContain(RUN_NAME);
      expect(text).not.toContain('120.00');
      expect(await pdfImageCount(pdf)).toBeGreaterThan(0);
      await page.close();
    } finally {
      await fresh.close();
    }
  });

  it('shows "not available", nothing of the run and no PDF once the link has expired', { timeout: 60_000 }, async () => {
    const tech = await signInAs(t, 'technician', { email: account('technician').email, password: t.ctx.config.demoPassword });
    const made = (await tech.post('/api/share-links').send({ kind: 'run', targetId: runId, expiresInDays: 1 }).expect(201)).body as { token: string; link: { id: number } };
    // Thirty days on, as far as the link is concerned: its expiry moves into the past.
    await t.ctx.sequelize.query('UPDATE share_links SET expiresAt = UTC_TIMESTAMP(3) - INTERVAL 1 MINUTE WHERE id = ?', { replacements: [made.link.id] });
    const fresh = await launchBrowser();
    try {
      const page = await fresh.context.newPage();
      await page.goto(`${t.url}/s/${made.token}`);
      await page.getByRole('heading', { name: 'Report not available' }).waitFor();
      expect(await page.getByText(RUN_NAME).count()).toBe(0);
      expect(await page.getByRole('link', { name: 'Download PDF' }).count()).toBe(0);
      expect((await page.request.get(`${t.url}/api/shared/${made.token}/report.pdf`)).status()).toBe(404);
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
      expect((await page.request.get(`${t.url}/api/shared/${shareUrl.split('/s/')[1]}/report.pdf`)).status()).toBe(404);
    } finally {
      await fresh.close();
    }
  });
});
