import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { inject } from 'vitest';
import { ATTACHMENTS } from '../../../server/server.js';
import { createTestContext, type TestContext } from '../../integration/helpers/index.js';
import { launchBrowser, type TestBrowser } from './browser.js';

/** Where e2e tests leave screenshots for people to look at. */
export const SCREENSHOT_DIR = resolve('.data/screenshots');

/** A running demo app (real server, MariaDB, bench manager, /ws) and a browser for one e2e file. */
export interface E2eApp {
  t: TestContext;
  browser: TestBrowser;
  close(): Promise<void>;
}

/** Starts the seeded demo app serving the client built once by tests/setup/e2e-client.ts, and a browser. */
export async function startE2eApp(): Promise<E2eApp> {
  const t = await createTestContext({ demo: true, users: false, attachments: ATTACHMENTS, config: { clientDir: inject('e2eClientDir') } });
  const browser = await launchBrowser();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  return {
    t,
    browser,
    async close() {
      await browser.close();
      await t.close();
    },
  };
}
