import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { ReadlineParser, SerialPort } from 'serialport';
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

  it('--ideal and --sample-period: a perfect meter writes every sample at the chosen period', () => {
    const result = run('--scenario', 'noisy-meter-unplug', '--ideal', '--sample-period', '0.5', '--speed', '1000000');
    const lines = result.stdout.trim().split('\r\n');
    // 2100 s of program at 0.5 s a sample, plus the sample at t = 0 and the header.
    expect(lines.length).toBe(2100 / 0.5 + 1 + 1);
    expect(lines.slice(1, 4).map((l) => l.split(',')[0])).toEqual(['0.0', '0.5', '1.0']);
  });

  it('rejects a bad format and an unknown scenario with a clear message', () => {
    const badFormat = run('--scenario', 'lfp-12v-weak-cell', '--format', 'xml');
    expect(badFormat.status).toBe(1);
    expect(badFormat.stderr).toMatch(/--format/);
    const unknown = run('--scenario', 'no-such-pack');
    expect(unknown.status).toBe(1);
    expect(unknown.stderr).toMatch(/Unknown scenario "no-such-pack"/);
  });

  it('serves a meter on a pseudo-terminal until stopped, then removes the link', async () => {
    const linkPath = `/tmp/kneepoint-sim-cli-${process.pid}`;
    const child = spawn(TSX, ['simulator/cli.ts', '--scenario', 'lfp-12v-weak-cell', '--format', 'jsonl', '--speed', '20', '--out', linkPath], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
    const exited = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));
    try {
      const deadline = Date.now() + 30_000;
      while (!existsSync(linkPath) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      const port = new SerialPort({ path: linkPath, baudRate: 115200 });
      const lines: string[] = [];
      port.pipe(new ReadlineParser({ delimiter: '\n' })).on('data', (l: string) => lines.push(l));
      while (lines.length < 6 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
      port.close();
      // The port opened mid-stream, so its first line may be a tail: skip it.
      const ts = lines.slice(1).map((l) => (JSON.parse(l) as { t: number }).t);
      expect(ts.length).toBeGreaterThanOrEqual(5);
      for (let i = 1; i < ts.length; i += 1) expect(ts[i] - ts[i - 1]).toBe(1);
    } finally {
      child.kill('SIGTERM');
    }
    expect(await exited).toBe(0);
    expect(existsSync(linkPath)).toBe(false);
  });
});
