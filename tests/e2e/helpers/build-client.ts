import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { build } from 'vite';

/**
 * Builds the client into a fresh temporary folder and returns it with a cleanup. Not under
 * .data/: Express's static server refuses paths with a dot-folder in them.
 */
export async function buildClient(): Promise<{ dir: string; remove(): void }> {
  const dir = mkdtempSync(join(tmpdir(), 'kneepoint-e2e-client-'));
  await build({ configFile: resolve('vite.config.ts'), logLevel: 'warn', build: { outDir: dir, emptyOutDir: true, sourcemap: false } });
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}
