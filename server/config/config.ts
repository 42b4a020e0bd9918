import { resolve } from 'node:path';
import { EnvSchema, type Env } from './env-schema.js';
import type { TrustProxySetting } from './proxy-settings.js';
import { loadOrCreateSecrets } from './secrets.js';
import { MS_PER_HOUR, MS_PER_MINUTE, MS_PER_S } from '../../shared/units/time.js';

/** Where and how to reach the application database. */
export interface DatabaseConfig {
  host: string;
  port: number;
  database: string;
  user: string;
  password: string;
}

/** The checked configuration the whole server reads (never process.env directly). */
export interface AppConfig {
  mode: Env['KNEEPOINT_MODE'];
  host: string;
  port: number;
  dataDir: string;
  clientDir: string;
  db: DatabaseConfig & { provision: boolean; mariadbDir: string };
  sessionSecret: string;
  cookieSecure: boolean;
  sessionMaxAgeMs: number;
  bodyLimit: string;
  loginMaxFailures: number;
  loginWindowMs: number;
  demoPassword: string;
  /** Scheduled backups: `dir` null = none (the npm scripts still back up and restore by hand). */
  backup: { dir: string | null; everyMs: number; keep: number };
  /** Express's `trust proxy`: whose forwarded address and scheme to believe (default nobody). */
  trustProxy: TrustProxySetting;
  /** Alarm delivery (mail and retries); optional so that configs built by hand take the defaults. */
  alarms?: AlarmDeliveryConfig;
  /** Public host names (or name:port) accepted in the Host header besides the loopback ones. */
  allowedHosts: string[];
  /** Bench gateways over MQTT; absent or null: none (everything runs on this machine). */
  mqtt?: MqttConfig | null;
}

/** Where the server meets its bench gateways. */
export interface MqttConfig {
  /** The broker's URL with the server's credentials; null with `local` (the private broker's own). */
  url: string | null;
  /** Start a private Mosquitto on loopback (KNEEPOINT_MQTT=local). */
  local: boolean;
  localPort: number;
}

/** How alarms are delivered: SMTP (or the local fake), links, and the retry back-off. */
export interface AlarmDeliveryConfig {
  /** null: the local fake SMTP server (never in production). */
  smtpUrl: string | null;
  smtpRequireTls: boolean;
  mailFrom: string;
  /** null: http://host:port of this server. */
  publicUrl: string | null;
  fakeSmtpPort: number;
  retryFirstMs: number;
  retryMaxMs: number;
  maxAttempts: number;
}


/** Thrown when the environment is invalid; the message names every bad variable. */
export class ConfigError extends Error {}

/** Checks `env` and names every bad variable at once, so one restart fixes them all. */
export function parseEnv(env: NodeJS.ProcessEnv): Env {
  const result = EnvSchema.safeParse(env);
  if (result.success) return result.data;
  const lines = result.error.issues.map((issue) => `  ${issue.path.join('.')}: ${issue.message}`);
  throw new ConfigError(`Invalid environment:\n${lines.join('\n')}`);
}

/** Reads and checks the environment once; secrets absent outside production are generated. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env, cwd = process.cwd()): AppConfig {
  const parsed = parseEnv(env);
  const dataDir = resolve(cwd, parsed.KNEEPOINT_DATA_DIR);
  if (parsed.KNEEPOINT_MODE === 'production') {
    const missing = ['SESSION_SECRET', 'KNEEPOINT_DB_PASSWORD'].filter((name) => !env[name]);
    if (missing.length > 0) {
      throw new ConfigError(`Invalid environment:\n${missing.map((n) => `  ${n}: required in production`).join('\n')}`);
    }
  }
  const needsStored = !parsed.SESSION_SECRET || !parsed.KNEEPOINT_DB_PASSWORD;
  const stored = needsStored ? loadOrCreateSecrets(dataDir) : undefined;
  return {
    mode: parsed.KNEEPOINT_MODE,
    host: parsed.KNEEPOINT_HOST,
    port: parsed.KNEEPOINT_PORT,
    dataDir,
    clientDir: resolve(cwd, parsed.KNEEPOINT_CLIENT_DIR),
    db: {
      provision: parsed.KNEEPOINT_DB_PROVISION,
      mariadbDir: resolve(dataDir, 'mariadb'),
      host: '127.0.0.1',
      port: parsed.KNEEPOINT_DB_PORT,
      database: parsed.KNEEPOINT_DB_NAME,
      user: parsed.KNEEPOINT_DB_USER,
      password: parsed.KNEEPOINT_DB_PASSWORD ?? stored!.dbPassword,
    },
    sessionSecret: parsed.SESSION_SECRET ?? stored!.sessionSecret,
    cookieSecure: parsed.KNEEPOINT_COOKIE_SECURE,
    sessionMaxAgeMs: parsed.KNEEPOINT_SESSION_HOURS * MS_PER_HOUR,
    bodyLimit: parsed.KNEEPOINT_BODY_LIMIT,
    loginMaxFailures: parsed.KNEEPOINT_LOGIN_MAX_FAILURES,
    loginWindowMs: parsed.KNEEPOINT_LOGIN_WINDOW_MINUTES * MS_PER_MINUTE,
    demoPassword: parsed.KNEEPOINT_DEMO_PASSWORD,
    backup: {
      dir: parsed.KNEEPOINT_BACKUP_DIR ? resolve(cwd, parsed.KNEEPOINT_BACKUP_DIR) : null,
      everyMs: parsed.KNEEPOINT_BACKUP_EVERY_HOURS * MS_PER_HOUR,
      keep: parsed.KNEEPOINT_BACKUP_KEEP,
    },
    alarms: {
      smtpUrl: parsed.KNEEPOINT_SMTP_URL ?? null,
      smtpRequireTls: parsed.KNEEPOINT_SMTP_REQUIRE_TLS,
      mailFrom: parsed.KNEEPOINT_MAIL_FROM,
      publicUrl: parsed.KNEEPOINT_PUBLIC_URL?.replace(/\/+$/, '') ?? null,
      fakeSmtpPort: parsed.KNEEPOINT_FAKE_SMTP_PORT,
      retryFirstMs: parsed.KNEEPOINT_DELIVERY_RETRY_FIRST_SECONDS * MS_PER_S,
      retryMaxMs: parsed.KNEEPOINT_DELIVERY_RETRY_MAX_SECONDS * MS_PER_S,
      maxAttempts: parsed.KNEEPOINT_DELIVERY_MAX_ATTEMPTS,
    },
    trustProxy: parsed.KNEEPOINT_TRUST_PROXY,
    allowedHosts: parsed.KNEEPOINT_ALLOWED_HOSTS,
    mqtt:
      parsed.KNEEPOINT_MQTT === 'local' || parsed.KNEEPOINT_MQTT_URL
        ? { url: parsed.KNEEPOINT_MQTT === 'local' ? null : parsed.KNEEPOINT_MQTT_URL!, local: parsed.KNEEPOINT_MQTT === 'local', localPort: parsed.KNEEPOINT_MQTT_PORT }
        : null,
  };
}
