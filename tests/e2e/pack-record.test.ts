import sharp from 'sharp';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import type { TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { axeViolations } from './helpers/axe.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { overflowPx, settle, smallTouchTargets, widestElements } from './helpers/screens.js';
import { signInThroughForm } from './helpers/sign-in.js';

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

/** A phone held upright (CSS px), the narrowest screen the pages must fit without sideways scrolling. */
const PHONE_WIDTH_PX = 390;
const PHONE_HEIGHT_PX = 844;
const PACK_LABEL = 'NG-0321';
/** WCAG 2.2 SC 2.5.5 (AAA) target size, which Kneepoint holds for a gloved hand at the bench. */
const TOUCH_TARGET_PX = 44;

/** A small JPEG photo of one colour, as a camera would send it (with EXIF). */
const photo = (colour: string) =>
  sharp({ create: { width: 1200, height: 900, channels: 3, background: colour } }).jpeg().withExif({ IFD0: { Make: 'Testmaker' } }).toBuffer();

/** Drops `bytes` as a file onto the element, the way a person drags a photo from the desktop. */
async function dropFile(page: Page, testId: string, index: number, name: string, bytes: Buffer) {
  // Browser-side code as text: the test config has no DOM types (the other e2e files do the same).
  const transfer = await page.evaluateHandle(`(() => {
    const dt = new DataTransfer();
    const bytes = Uint8Array.from(atob(${JSON.stringify(bytes.toString('base64'))}), (c) => c.charCodeAt(0));
    dt.items.add(new File([bytes], ${JSON.stringify(name)}, { type: 'image/jpeg' }));
    return dt;
  })()`);
  await page.getByTestId(testId).nth(index).dispatchEvent('drop', { dataTransfer: transfer });
}

describe('a pack registered, inspected and photographed', () => {
  it('shows the two teardown photos on the pack page, and the page fits a phone', async () => {
    const technician = DEMO_ACCOUNTS.find((a) => a.role === 'technician')!;
    const page = await browser.context.newPage();
    await signInThroughForm(page, t.url, technician.email, t.ctx.config.demoPassword);

    await page.goto(`${t.url}/batteries`);
    await page.getByRole('button', { name: 'Register a pack' }).click();
    const form = page.getByRole('form', { name: 'Register a pack' });
    await form.getByLabel('Label').fill(PACK_LABEL);
    await form.getByLabel('Brand').fill('Harlow Storage');
    await form.getByLabel('Cells in series').fill('8');
    await form.getByLabel('Rated capacity (Ah)').fill('50');
    await form.getByLabel('Received on').fill('2026-11-30');
    await form.getByLabel('Owner or client').fill('Canal Street Solar');
    await form.getByLabel('Length (mm)').fill('330');
    await form.getByLabel('Warranty (months)').fill('24');
    await form.getByRole('button', { name: 'Register pack' }).click();

    await page.getByRole('link', { name: `Open ${PACK_LABEL}` }).click();
    await page.getByRole('heading', { name: PACK_LABEL }).waitFor();
    expect(await page.getByRole('region', { name: 'Specifications' }).getByText('2 years').isVisible()).toBe(true);

    const welds = page.getByRole('listitem', { name: 'Interconnects and welds' });
    await welds.getByRole('group', { name: 'Rating of Interconnects and welds' }).getByRole('button', { name: 'Concern' }).click();
    await welds.getByRole('button', { name: 'Concern', pressed: true }).waitFor();
    await welds.getByLabel('Note on interconnects and welds').fill('Two welds on the negative busbar cracked');
    const saved = page.waitForResponse((r) => r.url().includes('/inspection/') && r.request().method() === 'PUT');
    await welds.getByRole('button', { name: 'Save note' }).click();
    expect((await saved).status()).toBe(200);

    // One photo dragged onto the item, one picked with the file chooser.
    await dropFile(page, 'photo-drop', 1, 'busbar-weld.jpg', await photo('#7a5a3a'));
    await welds.getByRole('img', { name: 'busbar-weld.jpg' }).waitFor();
    await welds.getByLabel('Add photos: interconnects and welds').setInputFiles({ name: 'weld-close-up.jpg', mimeType: 'image/jpeg', buffer: await photo('#3a5a7a') });
    await welds.getByRole('img', { name: 'weld-close-up.jpg' }).waitFor();

    // A fresh load of the pack page finds both, served as real images.
    await page.reload();
    const reloaded = page.getByRole('listitem', { name: 'Interconnects and welds' });
    await reloaded.getByRole('img', { name: 'weld-close-up.jpg' }).waitFor();
    for (const name of ['busbar-weld.jpg', 'weld-close-up.jpg']) {
      const img = reloaded.getByRole('img', { name });
      await img.scrollIntoViewIfNeeded(); // thumbnails load lazily, when they come into view
      const loadedWidthPx = () => img.evaluate((el) => {
        const image = el as unknown as { complete: boolean; naturalWidth: number };
        return image.complete ? image.naturalWidth : -1;
      });
      await expect.poll(loadedWidthPx).toBe(320); // THUMB_EDGE_PX: the 1200 px wide photo's thumbnail
    }
    expect(await reloaded.getByLabel('Note on interconnects and welds').inputValue()).toBe('Two welds on the negative busbar cracked');
    expect(await reloaded.getByRole('button', { name: 'Concern', pressed: true }).isVisible()).toBe(true);

    // The protection record comes from the server too (none run on a pack just received).
    await page.getByRole('region', { name: 'Protection record' }).getByText('No protection check has been run on this pack yet.').waitFor();

    // The whole page reads well (axe-core, WCAG 2.2 AA), and on a phone nothing is wider than
    // the screen and every control is a gloved finger's size.
    const findings: string[] = [];
    for (const scheme of ['light', 'dark'] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      // A fresh load in the new look: switching live animates the colours, and axe would measure mid-fade.
      await page.reload();
      await settle(page);
      await page.getByRole('listitem', { name: 'Interconnects and welds' }).getByRole('img', { name: 'weld-close-up.jpg' }).waitFor();
      for (const v of await axeViolations(page)) findings.push(`${scheme} ${v.rule} ${v.targets.join(' ')} ${v.summary}`);
    }
    await page.setViewportSize({ width: PHONE_WIDTH_PX, height: PHONE_HEIGHT_PX });
    await settle(page);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/pack-page-phone.png`, fullPage: true });
    const wide = (await overflowPx(page)) > 0 ? await widestElements(page) : [];
    expect({ findings, wide, small: await smallTouchTargets(page, TOUCH_TARGET_PX) }).toEqual({ findings: [], wide: [], small: [] });

    // The register's filter, pages and export fit the phone too (its rows become cards).
    await page.goto(`${t.url}/batteries`);
    await settle(page);
    await page.getByRole('link', { name: `Open ${PACK_LABEL}` }).waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/pack-register-phone.png`, fullPage: true });
    const registerWide = (await overflowPx(page)) > 0 ? await widestElements(page) : [];
    expect({ registerWide, small: await smallTouchTargets(page, TOUCH_TARGET_PX) }).toEqual({ registerWide: [], small: [] });
    await page.close();
  });
});
