import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, signInAs, type TestContext } from './helpers/index.js';

/** A built client in miniature: a page, a script and the script's source map. */
function builtClient(): string {
  const dir = mkdtempSync(join(tmpdir(), 'kp-client-'));
  mkdirSync(join(dir, 'assets'));
  writeFileSync(join(dir, 'index.html'), '<!doctype html><title>Kneepoint</title><script src="/assets/app.js"></script>');
  writeFileSync(join(dir, 'assets', 'app.js'), 'console.log(1);\n//# sourceMappingURL=app.js.map\n');
  writeFileSync(join(dir, 'assets', 'app.js.map'), JSON.stringify({ version: 3, sources: ['src/app.tsx'], sourcesContent: ['// the whole source'], mappings: '' }));
  return dir;
}

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext({ config: { clientDir: builtClient() } });
});
afterAll(() => t?.close());

describe('client source maps', () => {
  it('are refused without sign-in, while the page and scripts are served to anyone', async () => {
    await request(t.url).get('/assets/app.js').expect(200);
    await request(t.url).get('/').set('Accept', 'text/html').expect(200);
    const refused = await request(t.url).get('/assets/app.js.map').expect(401);
    expect(JSON.stringify(refused.body)).not.toContain('the whole source');
  });

  it('are served to a signed-in user, never cached by shared caches', async () => {
    const viewer = await signInAs(t, 'viewer');
    const map = await viewer.get('/assets/app.js.map').expect(200);
    expect(map.headers['cache-control']).toBe('private, no-store');
    expect(map.body.sourcesContent ?? JSON.parse(map.text).sourcesContent).toEqual(['// the whole source']);
  });
});
