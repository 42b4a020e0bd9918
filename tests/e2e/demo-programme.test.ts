import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_CONTROLLED_BENCH_NAME } from '../../server/benches/seed-demo-benches.js';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import { DEMO_PROGRAMME } from '../../server/programmes/seed-demo-programmes.js';
import { SIM_LOAD_SCPI, SIM_SUPPLY_SCPI } from '../../shared/schemas/instrument-presets.js';
import { signInAs, type TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

/** Simulated seconds a real second: the demo programme's three simulated hours play in about a minute. */
const SIMULATOR_SPEED = 200;
const PROGRAMME_WAIT_MS = 240_000;
const BENCH_READY_MS = 20_000;
const POLL_MS = 250;
const technician = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!;

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;
let benchId: number;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
  // Test set-up, not the technician: the demo bench runs faster than the demo's own 60×.
  const lab = await signInAs(t, 'admin', { email: admin.email, password: t.ctx.config.demoPassword });
  const benches = (await lab.get('/api/benches').expect(200)).body.benches as { id: number; name: string; source: Record<string, unknown> }[];
  const bench = benches.find((b) => b.name === DEMO_CONTROLLED_BENCH_NAME)!;
  benchId = bench.id;
  await lab.patch(`/api/benches/${benchId}`).send({ source: { ...bench.source, speed: SIMULATOR_SPEED } }).expect(200);
  const deadline = Date.now() + BENCH_READY_MS;
  for (;;) {
    const status = (await lab.get(`/api/benches/${benchId}`).expect(200)).body.bench.status as { state: string; message?: string };
    if (status.state === 'receiving') break;
    if (Date.now() > deadline) throw new Error(`the controlled demo bench is not receiving: ${JSON.stringify(status)}`);
    await new Promise((resolve) => setTimeout(resolve, POLL_MS));
  }
});

afterAll(async () => {
  await app?.close();
});

describe('the demo full capacity programme', () => {
  it('a technician arms a run on the controlled bench, starts the demo programme, and comes back to per-step results and a safe bench', { timeout: PROGRAMME_WAIT_MS + 60_000 }, async () => {
    const page = await browser.context.newPage();
    await signInThroughForm(page, t.url, technician.email, t.ctx.config.demoPassword);
    await page.goto(`${t.url}/benches/${benchId}`);
    const form = page.getByRole('form', { name: 'Start a run' });
    await form.waitFor();
    const packPicker = form.getByLabel('Battery pack');
    const pack = await packPicker.locator('option', { hasText: 'Wren' }).first().getAttribute('value');
    await packPicker.selectOption(pack!);
    await form.getByLabel('Run name').fill('Wren bench pack, demo capacity programme');
    // The programme ends the run; no stop rule of the run's own.
    await form.getByLabel('Stop').selectOption('manual');
    await form.getByRole('button', { name: 'Arm the run' }).click();
    await page.getByRole('heading', { name: 'Wren bench pack, demo capacity programme' }).waitFor();

    const start = page.getByRole('form', { name: 'Start a programme' });
    await start.waitFor();
    await start.getByLabel('Programme', { exact: true }).selectOption({ label: DEMO_PROGRAMME.name });
    const startButton = start.getByRole('button', { name: 'Start programme' });
    // The cautions come first: without the acknowledgement the programme cannot start.
    expect(await startButton.isDisabled()).toBe(true);
    await start.getByRole('checkbox', { name: /read these cautions/ }).check();
    await startButton.click();
    await page.getByTestId('current-step').waitFor({ timeout: 20_000 });

    // Walk away; come back when the programme says it is over.
    try {
      await page.getByRole('heading', { name: new RegExp(`^Programme .*: (finished|failed safe|aborted)`) }).waitFor({ timeout: PROGRAMME_WAIT_MS });
      const over = (await page.evaluate(`fetch('/api/runs?q=demo%20capacity%20programme').then((r) => r.json()).then((b) => fetch('/api/runs/' + b.runs[0].id + '/programme')).then((r) => r.json())`)) as {
        programme: { state: string; failReason: string | null };
      };
      expect({ state: over.programme.state, failReason: over.programme.failReason }).toEqual({ state: 'finished', failReason: null });
      expect(await page.getByRole('heading', { name: /^Programme / }).textContent()).toBe(`Programme ${DEMO_PROGRAMME.name}: finished`);
    } catch (error) {
      // Leave what the page showed for whoever reads the failure.
      await page.screenshot({ path: `${SCREENSHOT_DIR}/demo-programme-not-finished.png`, fullPage: true });
      throw error;
    }
    const rows = page.getByRole('table', { name: 'Step results' }).locator('tbody tr');
    expect(await rows.count()).toBe(DEMO_PROGRAMME.steps.length);
    for (let i = 0; i < DEMO_PROGRAMME.steps.length; i++) expect(await rows.nth(i).textContent()).toMatch(/done:/);
    await page.getByRole('list', { name: 'Round trips' }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/demo-programme-finished.png`, fullPage: true });

    const runs = (await page.evaluate(`fetch('/api/runs?q=demo%20capacity%20programme').then((r) => r.json())`)) as { runs: { id: number }[] };
    const runId = runs.runs[0]!.id;
    const programme = ((await page.evaluate(`fetch('/api/runs/${runId}/programme').then((r) => r.json())`)) as {
      programme: { state: string; results: { outcome: string; chargeAh: number; dischargeAh: number }[] };
    }).programme;
    expect(programme.state).toBe('finished');
    // The discharge from full at 1C gave most of the simulated 20 Ah pack (demo scenario, invented figures);
    // the charges put charge in and the rests neither.
    const [charge, rest1, discharge, rest2, recharge] = programme.results;
    expect(discharge!.dischargeAh).toBeGreaterThan(15);
    expect(charge!.chargeAh).toBeGreaterThan(0);
    expect(recharge!.chargeAh).toBeGreaterThan(15);
    for (const rest of [rest1!, rest2!]) expect(Math.abs(rest.chargeAh) + Math.abs(rest.dischargeAh)).toBeLessThan(0.05);
    const run = ((await page.evaluate(`fetch('/api/runs/${runId}').then((r) => r.json())`)) as { run: { state: string } }).run;
    expect(run.state).toBe('finished');

    // The bench is safe: the last word to each instrument switched its output off, and the instrument took it.
    const log: { id: number; instrumentId: string; sent: string; reply: string | null; problem: string | null }[] = [];
    for (;;) {
      const after = log.at(-1)?.id ?? 0;
      const page1 = ((await page.evaluate(`fetch('/api/runs/${runId}/command-log?afterId=${after}').then((r) => r.json())`)) as { commands: typeof log }).commands;
      if (page1.length === 0) break;
      log.push(...page1);
    }
    const lastOutputCommand = (id: string, words: string[]) => log.filter((c) => c.instrumentId === id && words.includes(c.sent)).at(-1);
    const loadOff = lastOutputCommand('demo-load', [SIM_LOAD_SCPI.outputOn, SIM_LOAD_SCPI.outputOff]);
    const supplyOff = lastOutputCommand('demo-supply', [SIM_SUPPLY_SCPI.outputOn, SIM_SUPPLY_SCPI.outputOff]);
    expect(loadOff).toMatchObject({ sent: SIM_LOAD_SCPI.outputOff, problem: null });
    expect(supplyOff).toMatchObject({ sent: SIM_SUPPLY_SCPI.outputOff, problem: null });
    await page.close();
  });
});
