import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

/** The simulator's fastest speed: the two-hour demo discharge plays in about 7 s. */
const SIMULATOR_SPEED = 1000;
const SCENARIO = 'lfp-12v-100ah-cp-cutoff';
const SCENARIO_END_WAIT_MS = 60_000;
const POLL_MS = 250;
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;
const technician = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;
let benchId: number;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
  // Test set-up, not the technician: the demo bench runs fast, and its scenario has already
  // played to the end (pack cut off) before anyone arrives, as on a demo server left running.
  const lab = await signInAs(t, 'admin', { email: admin.email, password: t.ctx.config.demoPassword });
  const benches = (await lab.get('/api/benches').expect(200)).body.benches as { id: number; source: { kind: string; scenario?: string } }[];
  const bench = benches.find((b) => b.source.scenario === SCENARIO)!;
  benchId = bench.id;
  await lab.patch(`/api/benches/${benchId}`).send({ source: { ...bench.source, speed: SIMULATOR_SPEED } }).expect(200);
  const deadline = Date.now() + SCENARIO_END_WAIT_MS;
  for (;;) {
    const status = (await lab.get(`/api/benches/${benchId}`).expect(200)).body.bench.status as { state: string; message?: string };
    if (status.state === 'idle' && /finished/.test(status.message ?? '')) break;
    if (Date.now() > deadline) throw new Error(`the simulated scenario did not finish: ${JSON.stringify(status)}`);
    await new Promise((resolve) => setTimeout(resolve, POLL_MS));
  }
});

afterAll(async () => {
  await app?.close();
});

describe('a demo that starts fresh', () => {
  it('a technician alone arms a run on a played-out simulated bench and takes it from a full pack to the end', { timeout: 120_000 }, async () => {
    const page = await browser.context.newPage();
    page.on('dialog', (dialog) => void dialog.accept());
    await signInThroughForm(page, t.url, technician.email, t.ctx.config.demoPassword);
    // The board: the played-out bench's last numbers are dimmed and say how old they are.
    const card = page.locator('div.relative', { has: page.getByRole('heading', { name: /Bench A/ }) }).first();
    await card.getByTestId('reading-age').waitFor();
    expect(await card.getByTestId('big-volts').getAttribute('data-stale')).toBe('true');
    await page.goto(`${t.url}/benches/${benchId}`);
    await page.getByTestId('reading-age').first().waitFor();
    const form = page.getByRole('form', { name: 'Start a run' });
    await form.waitFor();
    expect(await page.getByTestId('fresh-simulated-pack').isVisible()).toBe(true);
    const packPicker = form.getByLabel('Battery pack');
    const pack = await packPicker.locator('option', { hasText: ' 4S ' }).first().getAttribute('value');
    await packPicker.selectOption(pack!);
    await form.getByLabel('Run name').fill('Kestrel camper, fresh demo pack');
    await form.getByRole('button', { name: 'Arm the run' }).click();
    await page.getByRole('heading', { name: 'Kestrel camper, fresh demo pack' }).waitFor();

    // The fresh pack starts full: a 12.8 V LFP pack at rest reads above 13 V (common practice).
    await page.getByTestId('big-volts').filter({ hasText: /^1[34]\.\d\d$/ }).waitFor({ timeout: 15_000 });
    // "N frames ok" in the header moves while readings arrive (no status change needed).
    const framesOk = async () => Number((await page.getByText(/\d+ frames ok/).textContent())!.match(/(\d+) frames ok/)![1]);
    const before = await framesOk();
    await expect.poll(framesOk, { timeout: 5_000 }).toBeGreaterThan(before);
    await page.getByRole('alert').filter({ hasText: 'CUTOFF' }).waitFor({ timeout: 60_000 });
    await page.getByRole('button', { name: 'Acknowledge (A)' }).click();
    // The form's default stop rule ends the run by itself once the pack has recovered.
    await page.getByText('Finished', { exact: true }).first().waitFor({ timeout: 60_000 });

    const listed = (await page.evaluate(`fetch('/api/runs?q=fresh%20demo%20pack').then((r) => r.json())`)) as { runs: { id: number }[] };
    const run = ((await page.evaluate(`fetch('/api/runs/${listed.runs[0]!.id}').then((r) => r.json())`)) as {
      run: { state: string; summary: { dischargeAh: number; cutoffVolts: number | null } };
    }).run;
    expect(run.state).toBe('finished');
    // The scenario's 100 Ah pack gave most of its charge before the cutoff (demo scenario, invented figures).
    expect(run.summary.dischargeAh).toBeGreaterThan(50);
    expect(run.summary.cutoffVolts).not.toBeNull();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/demo-fresh-finished.png`, fullPage: true });
    await page.close();
  });
});
