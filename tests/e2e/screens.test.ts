import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import { axeViolations } from './helpers/axe.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { overflowPx, settle, smallTouchTargets, widestElements } from './helpers/screens.js';
import { signInThroughForm } from './helpers/sign-in.js';

const NASA_CSV = fileURLToPath(new URL('../fixtures/nasa-pcoe-b0005-discharge-cycle1.csv', import.meta.url));
/** A phone in portrait, the size the screens must fit (CSS pixels). */
const PHONE = { width: 390, height: 844 };
/** WCAG 2.2 SC 2.5.5 (AAA) target size, which Kneepoint holds for a gloved hand at the bench. */
const TOUCH_TARGET_PX = 44;
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;
const technician = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;
let paths: string[] = [];
const runIds: number[] = [];

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
  const password = t.ctx.config.demoPassword;
  // Two finished runs (a public discharge log imported twice) for the run and compare pages.
  const tech = await signInAs(t, 'technician', { email: technician.email, password });
  for (const name of ['Cell B0005 first discharge', 'Cell B0005 again']) {
    const res = await tech.post('/api/runs/import').field('name', name).field('endVolts', '2.7').field('currentSign', 'auto').attach('file', NASA_CSV).expect(201);
    runIds.push(res.body.run.id as number);
  }
  const benchId = ((await tech.get('/api/benches').expect(200)).body.benches as { id: number }[])[0].id;
  // A pack of our own for the pack page (fictional brand, demo data).
  const pack = await tech.post('/api/batteries').send({ label: 'Screens check pack', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 20 }).expect(201);
  paths = [
    '/',
    `/benches/${benchId}`,
    `/benches/${benchId}/setup`,
    '/benches/new',
    `/benches/${benchId}/room`,
    '/runs',
    `/runs/${runIds[0]}`,
    `/runs/compare?ids=${runIds.join(',')}`,
    '/runs/compare?packs=',
    '/batteries',
    `/batteries/${pack.body.battery.id as number}`,
    '/programmes',
    '/instruments',
    '/alarms',
    '/users',
    '/settings',
    '/account',
    '/no-such-page',
  ];
});

afterAll(async () => {
  await app?.close();
});

async function signedInPage(colorScheme: 'light' | 'dark', viewport?: typeof PHONE): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.context.newPage();
  if (viewport) await page.setViewportSize(viewport);
  await page.emulateMedia({ colorScheme });
  await signInThroughForm(page, t.url, admin.email, t.ctx.config.demoPassword);
  return page;
}

describe('every page reads well in both looks (axe-core: WCAG 2.2 AA and structure)', () => {
  for (const scheme of ['light', 'dark'] as const) {
    it(`has no axe violations in the ${scheme} look, which follows the system preference`, { timeout: 180_000 }, async () => {
      const findings: string[] = [];
      // The sign-in page, signed out.
      await browser.context.clearCookies();
      const out = await browser.context.newPage();
      await out.emulateMedia({ colorScheme: scheme });
      await out.goto(`${t.url}/sign-in`);
      await settle(out);
      expect(await out.evaluate(`document.documentElement.classList.contains('dark')`)).toBe(scheme === 'dark');
      for (const v of await axeViolations(out)) findings.push(`/sign-in ${v.rule} ${v.targets.join(' ')} ${v.summary}`);
      await out.close();

      const page = await signedInPage(scheme);
      for (const path of paths) {
        await page.goto(`${t.url}${path}`);
        await settle(page);
        for (const v of await axeViolations(page)) findings.push(`${path} ${v.rule} ${v.targets.join(' ')} ${v.summary}`);
      }
      await page.screenshot({ path: `${SCREENSHOT_DIR}/screens-${scheme}.png` });
      await page.close();
      expect(findings).toEqual([]);
    });
  }
});

describe('the sign-in page', () => {
  it('loads without a single console error (no failed "who is signed in" request)', async () => {
    await browser.context.clearCookies();
    const page = await browser.context.newPage();
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('requestfailed', (r) => errors.push(`failed ${r.url()}`));
    page.on('response', (r) => {
      if (r.status() >= 400) errors.push(`${r.status()} ${r.url()}`);
    });
    await page.goto(`${t.url}/`);
    await page.waitForURL(/\/sign-in/);
    await settle(page);
    await page.close();
    expect(errors).toEqual([]);
  });
});

describe('every page fits a phone (390 x 844)', () => {
  it('nothing is wider than the viewport and every control is at least 44 px', { timeout: 180_000 }, async () => {
    const page = await signedInPage('light', PHONE);
    const wide: string[] = [];
    const small: string[] = [];
    for (const path of paths) {
      await page.goto(`${t.url}${path}`);
      await settle(page);
      if ((await overflowPx(page)) > 0) wide.push(`${path}: ${(await widestElements(page)).join(', ')}`);
      for (const s of await smallTouchTargets(page, TOUCH_TARGET_PX)) small.push(`${path}: ${s}`);
    }
    await page.close();
    expect({ wide, small }).toEqual({ wide: [], small: [] });
  });

  it('keeps the Verdict column in view on the runs and compare tables without sideways scrolling', { timeout: 60_000 }, async () => {
    const page = await signedInPage('dark', PHONE);
    for (const path of ['/runs', paths.find((p) => p.startsWith('/runs/compare'))!]) {
      await page.goto(`${t.url}${path}`);
      await settle(page);
      const verdict = page.getByText(/^(Pass|Fail|Unrated)$/).first();
      await verdict.waitFor();
      const box = (await verdict.boundingBox())!;
      expect(box.x + box.width, path).toBeLessThanOrEqual(PHONE.width);
      await page.screenshot({ path: `${SCREENSHOT_DIR}/phone${path.replace(/[/?=,]/g, '-')}.png` });
    }
    await page.close();
  });
});

describe('small faults', () => {
  it('names the pack on the runs filter chip and exports without float noise, one column name in CSV and JSON', { timeout: 60_000 }, async () => {
    const page = await signedInPage('light');
    await page.goto(`${t.url}/batteries`);
    await page.getByRole('link', { name: 'Runs of Kestrel 12 V camper' }).first().click();
    await page.getByText('Only pack Kestrel 12 V camper').waitFor();
    const csv = (await page.evaluate(`fetch('/api/runs/${runIds[0]}/export.csv').then((r) => r.text())`)) as string;
    const json = (await page.evaluate(`fetch('/api/runs/${runIds[0]}/export.json').then((r) => r.json())`)) as { columns: string[]; rows: (number | null)[][] };
    const lines = csv.trim().split('\n').filter((l) => !l.startsWith('#'));
    expect(json.columns).toEqual(lines[0]!.split(','));
    expect(json.columns.some((c) => /^temp_\w+_c$/.test(c))).toBe(true);
    // Plain decimals, at most 4 places (docs/api.md, "Export").
    expect(lines.slice(1).join(',').split(',').filter((x) => /e/i.test(x) || (x.split('.')[1]?.length ?? 0) > 4)).toEqual([]);
    await page.close();
  });
});

describe('notes on a run, live for every open screen', () => {
  it('the author edits a note on one screen and another open screen shows it without a reload; a lab manager removes it', { timeout: 90_000 }, async () => {
    const password = t.ctx.config.demoPassword;
    const tech = await signInAs(t, 'technician', { email: technician.email, password });
    const runId = runIds[1]!;
    await tech.post(`/api/runs/${runId}/events`).send({ text: 'Pack opened: cell 3 swollen' }).expect(201);
    await browser.context.clearCookies();
    const author = await browser.context.newPage();
    await signInThroughForm(author, t.url, technician.email, password);
    const watcher = await browser.context.newPage();
    await watcher.goto(`${t.url}/runs/${runId}`);
    const watcherNotes = watcher.getByRole('region', { name: 'Notes' });
    await watcherNotes.getByText('Pack opened: cell 3 swollen', { exact: true }).waitFor();

    await author.goto(`${t.url}/runs/${runId}`);
    const notes = author.getByRole('region', { name: 'Notes' });
    await notes.getByRole('button', { name: 'Edit note: Pack opened: cell 3 swollen' }).click();
    const form = notes.getByRole('form', { name: 'Edit the note' });
    await form.getByLabel('Note').fill('Pack opened: cell 3 swollen, vent intact');
    await form.getByRole('button', { name: 'Save note' }).click();
    // The other screen follows over /ws; it is never reloaded.
    await watcherNotes.getByText('Pack opened: cell 3 swollen, vent intact', { exact: true }).waitFor({ timeout: 10_000 });
    await watcherNotes.getByText(/Note history \(1 changes\)/).waitFor();

    // A lab manager removes it (through the API here); both screens drop it, the history keeps it.
    const lab = await signInAs(t, 'admin', { email: admin.email, password });
    const events = (await lab.get(`/api/runs/${runId}/events`).expect(200)).body.events as { id: number; event: { type: string } }[];
    await lab.delete(`/api/runs/${runId}/events/${events.find((e) => e.event.type === 'annotation')!.id}`).expect(204);
    await watcherNotes.getByText('No notes on this run.').waitFor({ timeout: 10_000 });
    await notes.getByText('No notes on this run.').waitFor({ timeout: 10_000 });
    await watcherNotes.getByText(/Note history \(2 changes\)/).click();
    expect(await watcherNotes.getByRole('list', { name: 'Note history' }).textContent()).toMatch(/removed the note .*vent intact/);
    await watcher.screenshot({ path: `${SCREENSHOT_DIR}/run-notes-history.png`, fullPage: true });
    await author.close();
    await watcher.close();
  });
});
