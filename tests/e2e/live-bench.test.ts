import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Run } from '../../shared/schemas/run.js';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import type { TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';
import { demoDischarge, simulateLive } from './helpers/simulated-live.js';
import { timeColumn } from '../../shared/schemas/ws.js';

const RUN_ID = 101;
const RUN_SECONDS = 7200;
const technician = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;

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

function demoRun(benchId: number): Run {
  const now = new Date().toISOString();
  return {
    id: RUN_ID, name: 'Voltara 12.8 V 100 Ah · 600 W capacity', tags: ['lfp', 'demo'], origin: 'live', benchId, batteryId: 1,
    kind: 'capacity-discharge', state: 'recording', endVolts: { mode: 'per-cell', voltsPerCell: 2.5 }, acceptancePercent: 95,
    alarms: { onCutoff: true }, stopWhen: 'after-recovery', targetAh: null, targetWh: null, afterRecoverySeconds: 60,
    readingsCount: RUN_SECONDS + 1, summary: null, startedAt: now, endedAt: null, createdBy: 2, createdAt: now, updatedAt: now,
  };
}

describe('live bench page (live stream played by a /ws peer that speaks shared/schemas/ws.ts)', () => {
  it('shows big numbers, totals, chart and events, then raises the cutoff alarm', async () => {
    const page = await browser.context.newPage();
    await signInThroughForm(page, t.url, technician.email, t.ctx.config.demoPassword);
    const benches = (await page.evaluate(() => fetch('/api/benches').then((r) => r.json()))) as { benches: { id: number; name: string }[] };
    const [benchA, benchB] = benches.benches;
    const recent = demoDischarge(RUN_SECONDS);
    const live = await simulateLive(page, [
      { benchId: benchA.id, run: demoRun(benchA.id), recent, events: [{ type: 'run-start', elapsedSeconds: 0 }, { type: 'annotation', elapsedSeconds: 1800, text: 'Fan on, ambient 22 °C', author: 'Tomas' }] },
      { benchId: benchB.id, run: null, recent: { elapsedSeconds: [], volts: [], amps: [], watts: [], temps: {} }, events: [] },
    ]);

    await page.goto(`${t.url}/benches/${benchA.id}`);
    await page.getByRole('heading', { name: benchA.name, level: 1 }).waitFor();
    await page.getByTestId('big-volts').filter({ hasText: /^\d/ }).waitFor();
    const last = timeColumn(recent).length - 1;
    expect(await page.getByTestId('big-volts').textContent()).toBe(recent.volts[last].toFixed(2));
    expect(await page.getByTestId('big-energy-out').textContent()).toBe(recent.dischargeWh![last].toLocaleString('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 }));
    expect(await page.locator('[data-testid="live-chart"] canvas').count()).toBeGreaterThan(0);
    expect(await page.getByText('Fan on, ambient 22 °C').count()).toBe(1);
    // Numbers are drawn in the shipped JetBrains Mono, not a fallback.
    // (A string: this file is type-checked without the DOM library.)
    expect(await page.evaluate(`document.fonts.ready.then(() => document.fonts.check('700 16px "JetBrains Mono"'))`)).toBe(true);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/live-bench.png`, fullPage: true });

    live.pushEvent(RUN_ID, { type: 'cutoff', elapsedSeconds: RUN_SECONDS + 1, cause: 'protection', signal: 'current-zero', volts: 11.5, amps: 52, dischargeWh: 1200, dischargeAh: 96.2 });
    const banner = page.getByRole('alert').filter({ hasText: 'CUTOFF' });
    await banner.waitFor();
    expect(await banner.textContent()).toContain('pack protection opened');
    expect(await page.title()).toMatch(/CUTOFF/);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/live-bench-cutoff.png` });

    await page.keyboard.press('f');
    await page.waitForURL(/\/room$/);
    // Wait for the room view itself: the bench page's numbers may still be on screen a moment.
    await page.getByTestId('room-state').waitFor();
    await page.getByTestId('big-volts').filter({ hasText: /^\d/ }).waitFor();
    await page.getByRole('alert').filter({ hasText: 'CUTOFF' }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/room-view.png` });

    await page.keyboard.press('Escape');
    await page.waitForURL(new RegExp(`/benches/${benchA.id}$`));
    // A technician's phone: the same page must stay usable at 390 px.
    await page.setViewportSize({ width: 390, height: 844 });
    await page.getByTestId('big-volts').filter({ hasText: /^\d/ }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/live-bench-phone.png` });
    // Nothing runs off the side of the phone, on the bench page or in the room view.
    const overflowPx = `document.documentElement.scrollWidth - window.innerWidth`;
    // The chart takes the new width on its resize observer, a frame or more after the resize.
    await expect.poll(() => page.evaluate(overflowPx), { timeout: 10_000 }).toBe(0);
    await page.keyboard.press('f');
    await page.getByTestId('room-state').waitFor();
    await page.getByTestId('big-volts').filter({ hasText: /^\d/ }).waitFor();
    // The chart takes the new width on its resize observer, a frame or more after the resize.
    await expect.poll(() => page.evaluate(overflowPx), { timeout: 10_000 }).toBe(0);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/room-view-phone.png` });
    await page.keyboard.press('Escape');
    await page.waitForURL(new RegExp(`/benches/${benchA.id}$`));
    // The bench page (and its A shortcut) is back once its numbers are.
    await page.getByRole('heading', { name: benchA.name, level: 1 }).waitFor();
    await page.getByTestId('big-volts').filter({ hasText: /^\d/ }).waitFor();
    await banner.waitFor();
    await page.setViewportSize({ width: 1440, height: 900 });
    // The resize redraws the page; on a busy machine a key pressed before the redraw settles
    // can land while the shortcut is being attached again. Wait two frames, then press.
    await banner.getByRole('button', { name: 'Acknowledge (A)' }).waitFor();
    await page.evaluate(`new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve)))`);
    await page.keyboard.press('a');
    await banner.waitFor({ state: 'detached' });

    await page.goto(`${t.url}/benches/${benchB.id}`);
    await page.getByRole('form', { name: 'Start a run' }).waitFor();
    expect(await page.getByRole('region', { name: 'Safety cautions' }).textContent()).toMatch(/Lithium fire.*Hydrogen.*Short circuits.*Cold charging.*Unattended/s);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/start-run.png`, fullPage: true });
    await page.close();
  });
});
