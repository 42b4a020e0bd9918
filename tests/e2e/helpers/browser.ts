import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

/** The Debian package's Chromium; the tests never download a browser. */
export const CHROMIUM_PATH = process.env.KNEEPOINT_CHROMIUM ?? '/usr/bin/chromium';
const CHROMIUM_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];
/** Scratch space for profiles and Playwright's own temp folders, removed after the tests. */
const SCRATCH_ROOT = resolve('.data/e2e-tmp');

export interface TestBrowser {
  context: BrowserContext;
  close(): Promise<void>;
}

/**
 * Starts Chromium with a fresh profile. TMPDIR points into .data/e2e-tmp because Chromium
 * leaves `playwright_*` folders in TMPDIR; close() removes them with the profile.
 */
export async function launchBrowser(viewport = { width: 1440, height: 900 }): Promise<TestBrowser> {
  mkdirSync(SCRATCH_ROOT, { recursive: true });
  const scratch = mkdtempSync(join(SCRATCH_ROOT, 'run-'));
  const tmp = join(scratch, 'tmp');
  mkdirSync(tmp);
  const previousTmp = process.env.TMPDIR;
  process.env.TMPDIR = tmp;
  const context = await chromium.launchPersistentContext(join(scratch, 'profile'), {
    executablePath: CHROMIUM_PATH,
    args: CHROMIUM_FLAGS,
    headless: true,
    viewport,
    env: { ...process.env, TMPDIR: tmp },
  });
  // Page errors end up in the test output, where a failing test needs them.
  context.on('weberror', (e) => console.error('[browser error]', e.error().message));
  // (A 401 from /api/auth/me when signed out, and a refused /ws, are expected and not echoed.)
  context.on('console', (m) => {
    if (m.type() === 'error' && !/Failed to load resource|WebSocket connection/.test(m.text())) console.error('[browser console]', m.text());
  });
  return {
    context,
    close: async () => {
      await context.close();
      if (previousTmp === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = previousTmp;
      rmSync(scratch, { recursive: true, force: true });
    },
  };
}
