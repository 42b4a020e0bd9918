import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const FEATURES_DIR = resolve(__dirname);

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? filesUnder(path) : /\.tsx?$/.test(name) ? [path] : [];
  });
}

// bulletproof-react's rule: features compose in src/app, never import each other.
describe('feature boundaries', () => {
  it('no feature imports another feature', () => {
    const offences: string[] = [];
    for (const file of filesUnder(FEATURES_DIR)) {
      const parts = relative(FEATURES_DIR, file).split(/[\\/]/);
      if (parts.length < 2) continue; // this test itself
      const own = parts[0];
      const source = readFileSync(file, 'utf8');
      for (const match of source.matchAll(/from\s+'(\.[^']*)'/g)) {
        const target = resolve(join(file, '..'), match[1]);
        const rel = relative(FEATURES_DIR, target);
        if (!rel.startsWith('..') && rel.split(/[\\/]/)[0] !== own) offences.push(`${relative(FEATURES_DIR, file)} → ${match[1]}`);
      }
    }
    expect(offences).toEqual([]);
  });
});
