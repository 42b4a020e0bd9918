import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '../../server/db/seed-demo.js';
import type { TestContext } from '../integration/helpers/index.js';
import type { TestBrowser } from './helpers/browser.js';
import { SCREENSHOT_DIR, startE2eApp, type E2eApp } from './helpers/e2e-app.js';
import { signInThroughForm } from './helpers/sign-in.js';

const account = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!;

let t: TestContext;
let browser: TestBrowser;
let app: E2eApp;
let demoPassword: string;

beforeAll(async () => {
  app = await startE2eApp();
  ({ t, browser } = app);
  demoPassword = t.ctx.config.demoPassword;
});

afterAll(async () => {
  await app?.close();
});

async function navFor(role: string) {
  // One persistent profile for the file: each role starts from a signed-out browser.
  await browser.context.clearCookies();
  const page = await browser.context.newPage();
  await signInThroughForm(page, t.url, account(role).email, demoPassword);
  const labels = await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents();
  return { page, labels };
}

describe('each demo role signs in and sees what it may do', () => {
  it('sends a signed-out visitor to sign-in', async () => {
    await browser.context.clearCookies();
    const page = await browser.context.newPage();
    await page.goto(`${t.url}/runs`);
    await page.waitForURL(/\/sign-in\?next=%2Fruns$/);
    // The address changes before the sign-in page has drawn: wait for its heading.
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await page.close();
  });

  it('refuses a wrong password with a clear message', async () => {
    await browser.context.clearCookies();
    const page = await browser.context.newPage();
    await page.goto(`${t.url}/sign-in`);
    await page.getByLabel('E-mail').fill(account('viewer').email);
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('That e-mail and password do not match an account.').waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/sign-in-error.png` });
    await page.close();
  });

  it('admin sees users and lab settings, and can open the users list', async () => {
    const { page, labels } = await navFor('admin');
    expect(labels).toEqual(['Benches', 'Runs', 'Programmes', 'Batteries', 'Alarms', 'Instruments', 'Users', 'Lab settings', 'My account']);
    await page.getByRole('link', { name: 'Users' }).click();
    await page.getByRole('button', { name: 'Create user' }).waitFor();
    await page.locator('table tbody tr').first().waitFor();
    for (const a of DEMO_ACCOUNTS) expect(await page.getByText(a.email).count()).toBe(1);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/users-admin.png` });
    await page.getByRole('button', { name: 'Create user' }).click();
    const form = page.getByRole('form', { name: 'Create a user' });
    await form.getByLabel('Name').fill('Ines Okafor');
    await form.getByLabel('E-mail').fill('ines@harbourstreet.example');
    await form.getByLabel('Role').selectOption('viewer');
    await form.getByLabel('Starting password').fill('harbour-street-client');
    await form.getByRole('button', { name: 'Create user' }).click();
    await page.getByRole('cell', { name: 'ines@harbourstreet.example', exact: true }).waitFor();
    await page.close();
  });

  it('admin switches the lab to °F and every screen follows', async () => {
    const { page } = await navFor('admin');
    await page.getByRole('link', { name: 'Lab settings' }).click();
    await page.getByLabel('Temperature unit').selectOption('F');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Saved.').waitFor();
    await page.getByRole('link', { name: 'Benches' }).click();
    await page.getByRole('link', { name: /^Bench / }).first().waitFor();
    expect(await page.getByText('°F').count()).toBeGreaterThan(0);
    expect(await page.getByText('°C').count()).toBe(0);
    await page.getByRole('link', { name: 'Lab settings' }).click();
    await page.getByLabel('Temperature unit').selectOption('C');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Saved.').waitFor();
    await page.close();
  });

  it('technician registers packs but has no user management', async () => {
    const { page, labels } = await navFor('technician');
    expect(labels).not.toContain('Users');
    expect(labels).not.toContain('Lab settings');
    await page.getByRole('link', { name: 'Batteries' }).click();
    await page.getByRole('button', { name: 'Register a pack' }).waitFor();
    await page.getByRole('button', { name: 'Register a pack' }).click();
    expect(await page.getByRole('region', { name: 'Safety cautions' }).isVisible()).toBe(true);
    const form = page.getByRole('form', { name: 'Register a pack' });
    await form.getByLabel('Label').fill('NG-0150');
    await form.getByLabel('Brand').fill('Voltara');
    await form.getByLabel('Cells in series').fill('8');
    await form.getByLabel('Rated capacity (Ah)').fill('100');
    await form.getByRole('button', { name: 'Register pack' }).click();
    // The register names each pack by a link to its page.
    await page.getByRole('link', { name: 'Open NG-0150', exact: true }).waitFor();
    await page.goto(`${t.url}/users`);
    await page.getByText('Not available for your role').waitFor();
    await page.close();
  });

  it('viewer reads the packs and sees no create buttons', async () => {
    const { page, labels } = await navFor('viewer');
    expect(labels).toEqual(['Benches', 'Runs', 'Programmes', 'Batteries', 'Alarms', 'Instruments', 'My account']);
    await page.getByRole('link', { name: 'Batteries' }).click();
    await page.locator('table tbody tr').first().waitFor();
    expect(await page.getByRole('button', { name: 'Register a pack' }).count()).toBe(0);
    await page.screenshot({ path: `${SCREENSHOT_DIR}/batteries-viewer.png` });
    await page.close();
  });

  it('the dashboard shows the demo benches with their status', async () => {
    const { page } = await navFor('technician');
    await page.getByRole('link', { name: /^Bench / }).first().waitFor();
    await page.screenshot({ path: `${SCREENSHOT_DIR}/dashboard-technician.png` });
    await page.close();
  });
});
