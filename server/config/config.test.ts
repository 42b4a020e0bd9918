import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
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

describe('port variables', () => {
  const bad = ['', ' ', '0', '0x1F9B', '1e3', '8080.5', '-1', '65536', '+8080', ' 8080'];
  for (const name of ['KNEEPOINT_PORT', 'KNEEPOINT_DB_PORT']) {
    for (const value of bad) {
      it(`refuses ${name}=${JSON.stringify(value)} with a message naming the variable`, () => {
        expect(() => loadConfig({ [name]: value }, freshDir())).toThrow(ConfigError);
        expect(() => loadConfig({ [name]: value }, freshDir())).toThrow(new RegExp(`${name}: must be a port number from 1 to 65535`));
      });
    }
  }

  it('accepts plain decimal ports at both ends of the range', () => {
    expect(loadConfig({ KNEEPOINT_PORT: '1', KNEEPOINT_DB_PORT: '65535' }, freshDir())).toMatchObject({ port: 1, db: { port: 65535 } });
  });

  it('refuses a blank or hexadecimal failure limit', () => {
    expect(() => loadConfig({ KNEEPOINT_LOGIN_MAX_FAILURES: ' ' }, freshDir())).toThrow(/KNEEPOINT_LOGIN_MAX_FAILURES/);
    expect(() => loadConfig({ KNEEPOINT_LOGIN_MAX_FAILURES: '0x10' }, freshDir())).toThrow(/KNEEPOINT_LOGIN_MAX_FAILURES/);
  });
});

describe('secrets file', () => {
  const withSecrets = (content: string) => {
    const cwd = freshDir();
    mkdirSync(join(cwd, '.data'));
    writeFileSync(join(cwd, '.data', 'secrets.json'), content);
    return cwd;
  };

  for (const [what, content] of [
    ['empty', ''],
    ['blank', '  \n'],
    ['cut off mid-write', '{"sessionSecret": "abc'],
    ['not an object of secrets', '[1,2,3]'],
    ['holding a too-short secret', JSON.stringify({ sessionSecret: 'short', dbPassword: 'long-enough-password' })],
  ] as const) {
    it(`stops with a message naming the file when it is ${what}`, () => {
      const cwd = withSecrets(content);
      const file = join(cwd, '.data', 'secrets.json');
      expect(() => loadConfig({}, cwd)).toThrow(new RegExp(`secrets file ${file.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')} .*delete it`));
    });
  }

  it('stops with a message naming the file when it cannot be read', () => {
    const cwd = freshDir();
    // A directory where the file should be: reading it fails (EISDIR) even as root.
    mkdirSync(join(cwd, '.data', 'secrets.json'), { recursive: true });
    expect(() => loadConfig({}, cwd)).toThrow(/secrets file .*secrets\.json cannot be read/);
  });

  it('leaves no temporary file beside the secrets it wrote', () => {
    const cwd = freshDir();
    loadConfig({}, cwd);
    expect(readdirSync(join(cwd, '.data'))).toEqual(['secrets.json']);
  });
});

describe('proxy and host settings', () => {
  it('defaults to trusting no proxy and only loopback names', () => {
    expect(loadConfig({}, freshDir())).toMatchObject({ trustProxy: false, allowedHosts: [] });
  });

  it('reads a hop count, addresses and ranges, and host names', () => {
    expect(loadConfig({ KNEEPOINT_TRUST_PROXY: '1' }, freshDir()).trustProxy).toBe(1);
    expect(loadConfig({ KNEEPOINT_TRUST_PROXY: 'loopback, 10.0.0.5,fd00::/8' }, freshDir()).trustProxy).toEqual(['loopback', '10.0.0.5', 'fd00::/8']);
    expect(loadConfig({ KNEEPOINT_ALLOWED_HOSTS: 'Lab.Example.org, bench-pc:8443,[fe80::1]' }, freshDir()).allowedHosts).toEqual([
      'lab.example.org',
      'bench-pc:8443',
      '[fe80::1]',
    ]);
  });

  for (const value of ['true', 'yes', '', '11', '10.0.0.300', 'loopback,evil host']) {
    it(`refuses KNEEPOINT_TRUST_PROXY=${JSON.stringify(value)}`, () => {
      expect(() => loadConfig({ KNEEPOINT_TRUST_PROXY: value }, freshDir())).toThrow(/KNEEPOINT_TRUST_PROXY: must be false/);
    });
  }

  it('refuses a host list with something that is not a host name', () => {
    expect(() => loadConfig({ KNEEPOINT_ALLOWED_HOSTS: 'lab.example.org,http://x.example' }, freshDir())).toThrow(
      /KNEEPOINT_ALLOWED_HOSTS: not a host name or name:port: http:\/\/x.example/,
    );
  });
});
