import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import type { TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

/** The demo scenario's two-hour discharge plays in about 25 s at this speed. */
const SIMULATOR_SPEED = 300;
const CUTOFF_WAIT_MS = 75_000;
const SCENARIO = 'lfp-12v-100ah-cp-cutoff';
/** A registered 4-cell pack, the same series count as the simulated one. */
const PACK_CELLS_LABEL = '4S';
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

describe('a run from start to cutoff, through the real server, simulator and /ws', () => {
  it('admin speeds up the simulated bench, technician arms a run, the room sees the cutoff', { timeout: 150_000 }, async () => {
    const page = await browser.context.newPage();
    // A bench PC set to dark: the app follows the system until someone picks a look.
    await page.emulateMedia({ colorScheme: 'dark' });
    await signInThroughForm(page, t.url, account('admin').email, t.ctx.config.demoPassword);
    // The demo bench that plays the 12 V capacity scenario (found by its source, not its name).
    const benches = (await page.evaluate(`fetch('/api/benches').then((r) => r.json())`)) as {
      benches: { id: number; source: { kind: string; scenario?: string } }[];
    };
    const bench = benches.benches.find((b) => b.source.scenario === SCENARIO)!;
    expect(bench).toBeDefined();
    await page.goto(`${t.url}/benches/${bench.id}`);
    await page.getByRole('link', { name: 'Set up bench' }).click();
    await page.getByLabel('Speed (× real time)').fill(String(SIMULATOR_SPEED));
    await page.getByRole('button', { name: 'Save bench' }).click();
    await page.waitForURL(/\/benches\/\d+$/);
    const benchUrl = page.url();

    await browser.context.clearCookies();
    await signInThroughForm(page, t.url, account('technician').email, t.ctx.config.demoPassword);
    await page.goto(benchUrl);
    const form = page.getByRole('form', { name: 'Start a run' });
    await form.waitFor();
    const packPicker = form.getByLabel('Battery pack');
    const pack = await packPicker.locator('option', { hasText: ` ${PACK_CELLS_LABEL} ` }).first().getAttribute('value');
    await packPicker.selectOption(pack!);
    await form.getByLabel('Run name').fill('Kestrel camper 600 W capacity');
    await form.getByRole('button', { name: 'Arm the run' }).click();

    await page.getByRole('heading', { name: 'Kestrel camper 600 W capacity' }).waitFor();
    // N jumps to the note box; the note comes back over /ws onto the timeline.
    await page.keyboard.press('n');
    await page.keyboard.type('Load on, fan on, ambient 23 °C');
    await page.keyboard.press('Enter');
    await page.getByRole('list', { name: 'Run events' }).getByText('Load on, fan on, ambient 23 °C').waitFor();
    await page.getByTestId('big-energy-out').filter({ hasText: /^[1-9]/ }).waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('big-volts').textContent()).toMatch(/^1[0-4]\.\d\d$/);
    // A figure, not a check: frames drawn per second and long tasks while ~300 readings/s stream.
    const perf = (await page.evaluate(`new Promise((resolve) => {
      let frames = 0; let longTasks = 0; let longestMs = 0;
      const obs = new PerformanceObserver((list) => { for (const e of list.getEntries()) { longTasks++; longestMs = Math.max(longestMs, e.duration); } });
      try { obs.observe({ type: 'longtask', buffered: false }); } catch {}
      const start = performance.now();
      const tick = () => { frames++; if (performance.now() - start < 3000) requestAnimationFrame(tick); else { obs.disconnect(); resolve({ fps: frames / ((performance.now() - start) / 1000), longTasks, longestMs }); } };
      requestAnimationFrame(tick);
    })`)) as { fps: number; longTasks: number; longestMs: number };
    console.log(`[figure] live page while streaming: ${perf.fps.toFixed(1)} frames/s, ${perf.longTasks} long tasks (longest ${perf.longestMs.toFixed(0)} ms)`);

    // Opened again half-way, the chart gets the archived start of the run, not only the last seconds.
    const backfill = page.waitForResponse((r) => /\/api\/runs\/\d+\/readings\?/.test(r.url()) && r.status() === 200);
    await page.reload();
    await backfill;
    await page.getByTestId('big-energy-out').filter({ hasText: /^[1-9]/ }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/live-run-real.png`, fullPage: true });

    // The overview carries the run's totals too.
    await page.goto(`${t.url}/`);
    await page.getByText('Kestrel camper 600 W capacity').waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/dashboard-live.png` });
    await page.goto(benchUrl);

    await page.getByRole('alert').filter({ hasText: 'CUTOFF' }).waitFor({ timeout: CUTOFF_WAIT_MS });
    expect(await page.title()).toMatch(/CUTOFF/);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/live-run-real-cutoff.png`, fullPage: true });
    await page.getByRole('button', { name: 'Acknowledge (A)' }).click();

    await page.getByRole('link', { name: 'Runs', exact: true }).click();
    await page.getByRole('link', { name: 'Kestrel camper 600 W capacity' }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/runs-list.png` });
    await page.getByRole('link', { name: 'Kestrel camper 600 W capacity' }).click();
    await page.getByTestId('history-chart').locator('canvas').waitFor();
    expect(await page.getByText(/Cutoff \(/).count()).toBeGreaterThan(0);
    // Drag across the last tenth of the chart: the page asks the server for that window again.
    const over = page.getByTestId('history-chart').locator('.u-over');
    await over.scrollIntoViewIfNeeded();
    const box = (await over.boundingBox())!;
    const zoomed = page.waitForResponse((r) => /\/readings\?.*from=.*to=/.test(r.url()) && r.status() === 200);
    await page.mouse.move(box.x + box.width * 0.9, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.99, box.y + box.height / 2, { steps: 5 });
    await page.mouse.up();
    await zoomed;
    await page.getByRole('button', { name: 'Whole run' }).and(page.locator(':enabled')).waitFor();
    await page.getByTestId('history-chart').screenshot({ path: `${SCREENSHOT_DIR}/run-detail-zoomed-chart.png` });
    await page.screenshot({ path: `${SCREENSHOT_DIR}/run-detail.png`, fullPage: true });
    // The light "report" theme, as a client would print it.
    await page.getByRole('button', { name: /Switch to light/ }).click();
    expect(await page.evaluate(`document.documentElement.classList.contains('dark')`)).toBe(false);
    await page.getByTestId('history-chart').locator('canvas').waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/run-detail-light.png`, fullPage: true });
    await page.emulateMedia({ media: 'print' });
    await page.screenshot({ path: `${SCREENSHOT_DIR}/run-report-print.png`, fullPage: true });
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);

    // A log from another logger, imported, then laid over the live run.
    await page.emulateMedia({ media: 'screen' });
    await page.getByRole('link', { name: 'Runs', exact: true }).click();
    await page.getByRole('button', { name: 'Import a CSV log' }).click();
    const importForm = page.getByRole('form', { name: 'Import a logged run' });
    await importForm.getByLabel(/CSV file/).setInputFiles({ name: 'older-logger.csv', mimeType: 'text/csv', buffer: Buffer.from(demoCsv()) });
    await importForm.getByLabel('Run name').fill('Older logger, same pack');
    await importForm.getByRole('button', { name: 'Import' }).click();
    await page.getByRole('heading', { name: 'Older logger, same pack' }).waitFor();
    await page.getByRole('link', { name: 'Runs', exact: true }).click();
    await page.getByRole('checkbox', { name: 'Compare Older logger, same pack' }).check();
    await page.getByRole('checkbox', { name: 'Compare Kestrel camper 600 W capacity' }).check();
    await page.getByRole('link', { name: 'Compare 2 runs' }).click();
    await page.getByTestId('compare-chart').locator('canvas').waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/compare-runs.png`, fullPage: true });
    await page.close();
  });
});

/** An invented 1 Hz log of a 12 V pack on a 40 A load for 90 minutes, as another logger writes it (demo data). */
function demoCsv(): string {
  const lines = ['time,volts,amps,temperature'];
  const seconds = 5400;
  for (let t = 0; t <= seconds; t++) {
    const x = t / seconds;
    lines.push(`${t},${(13.2 - 0.5 * x - 1.5 * x ** 14).toFixed(3)},40.00,${(22 + 4 * x).toFixed(1)}`);
  }
  return lines.join('\n') + '\n';
}
