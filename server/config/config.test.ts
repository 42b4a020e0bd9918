import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ConfigError, loadConfig } from './config.js';

const freshDir = () => mkdtempSync(join(tmpdir(), 'kp-config-'));

describe('loadConfig', () => {
  it('uses the documented defaults and generates secrets into the data dir (mode 0600)', () => {
    const cwd = freshDir();
    const config = loadConfig({}, cwd);
    expect(config).toMatchObject({ host: '127.0.0.1', port: 8080, mode: 'demo', dataDir: join(cwd, '.data'), clientDir: join(cwd, 'dist/client') });
    expect(config.db).toMatchObject({ port: 3307, database: 'kneepoint', user: 'kneepoint', provision: true });
    expect(config.sessionSecret.length).toBeGreaterThanOrEqual(32);
    const secretsFile = join(cwd, '.data', 'secrets.json');
    expect(statSync(secretsFile).mode & 0o777).toBe(0o600);
    // A second start reads the same secrets (sessions survive restarts).
    expect(loadConfig({}, cwd).sessionSecret).toBe(config.sessionSecret);
    expect(JSON.parse(readFileSync(secretsFile, 'utf8')).sessionSecret).toBe(config.sessionSecret);
  });

  it('names every bad variable at once', () => {
    const env = { KNEEPOINT_PORT: 'eighty', KNEEPOINT_HOST: '::', KNEEPOINT_DB_PORT: '3306', SESSION_SECRET: 'short', KNEEPOINT_COOKIE_SECURE: 'maybe' };
    let message = '';
    try {
      loadConfig(env, freshDir());
    } catch (error) {
      expect(error).toBeInstanceOf(ConfigError);
      message = (error as Error).message;
    }
    for (const name of Object.keys(env)) expect(message).toContain(name);
  });

  it('requires real secrets in production instead of generating them', () => {
    expect(() => loadConfig({ KNEEPOINT_MODE: 'production' }, freshDir())).toThrow(/SESSION_SECRET[\s\S]*KNEEPOINT_DB_PASSWORD/);
  });

  it('reads the backup folder, interval and retention, and refuses nonsense in them', () => {
    const cwd = freshDir();
    expect(loadConfig({}, cwd).backup).toEqual({ dir: null, everyMs: 24 * 3_600_000, keep: 7 });
    expect(loadConfig({ KNEEPOINT_BACKUP_DIR: 'backups', KNEEPOINT_BACKUP_EVERY_HOURS: '6', KNEEPOINT_BACKUP_KEEP: '3' }, cwd).backup)
      .toEqual({ dir: join(cwd, 'backups'), everyMs: 6 * 3_600_000, keep: 3 });
    const bad = { KNEEPOINT_BACKUP_DIR: '  ', KNEEPOINT_BACKUP_EVERY_HOURS: '0', KNEEPOINT_BACKUP_KEEP: '0.5' };
    expect(() => loadConfig(bad, cwd)).toThrow(/KNEEPOINT_BACKUP_DIR[\s\S]*KNEEPOINT_BACKUP_EVERY_HOURS[\s\S]*KNEEPOINT_BACKUP_KEEP/);
  });
});
