import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { FrameSchema } from '../shared/schemas/frame.js';
import { listScenarios } from './scenario/registry.js';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const TSX = `${ROOT}node_modules/.bin/tsx`;
const run = (...args: string[]) => spawnSync(TSX, ['simulator/cli.ts', ...args], { cwd: ROOT, encoding: 'utf8', input: '', timeout: 60_000 });

describe('simulator CLI', { timeout: 90_000 }, () => {
  it('lists the scenarios', () => {
    const result = run('--list');
    expect(result.status).toBe(0);
    for (const s of listScenarios()) expect(result.stdout).toContain(s.name);
  });

  it('writes JSON-line frames to stdout; the same seed writes the same bytes, another seed other bytes', () => {
    const args = ['--scenario', 'noisy-meter-unplug', '--format', 'jsonl', '--speed', '1000000'];
    const a = run(...args, '--seed', '7');
    const b = run(...args, '--seed', '7');
    const c = run(...args, '--seed', '8');
    expect(a.status).toBe(0);
    const digest = (text: string) => createHash('sha256').update(text).digest('hex');
    expect(digest(b.stdout)).toBe(digest(a.stdout));
    expect(digest(c.stdout)).not.toBe(digest(a.stdout));
    const lines = a.stdout.trim().split('\n');
    // 2101 samples, minus the 45 s unplugged, minus drops; garbled lines may not parse.
    expect(lines.length).toBeGreaterThan(1900);
    expect(lines.length).toBeLessThan(2101 - 45);
    const parsed = lines.filter((l) => FrameSchema.safeParse((() => { try { return JSON.parse(l); } catch { return null; } })()).success);
    expect(parsed.length).toBeGreaterThan(0.97 * lines.length);
  });

  it('rejects a bad format and an unknown scenario with a clear message', () => {
    const badFormat = run('--scenario', 'lfp-12v-weak-cell', '--format', 'xml');
    expect(badFormat.status).toBe(1);
    expect(badFormat.stderr).toMatch(/--format/);
    const unknown = run('--scenario', 'no-such-pack');
    expect(unknown.status).toBe(1);
    expect(unknown.stderr).toMatch(/Unknown scenario "no-such-pack"/);
  });
});
