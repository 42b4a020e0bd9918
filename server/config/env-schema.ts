import { z } from 'zod';
import { AllowedHostsSchema, TrustProxySchema } from './proxy-settings.js';

const LOOPBACK_HOSTS = ['127.0.0.1', '::1', 'localhost'];
/** The system MariaDB's port: a private instance must never take it. */
export const SYSTEM_MARIADB_PORT = 3306;
const MAX_TCP_PORT = 65535;
const MIN_SECRET_LENGTH = 32;

/**
 * A TCP port written in plain decimal digits, 1 to 65535. Empty, blank, 0, hexadecimal (0x1F9B)
 * and exponent (1e3) forms are refused rather than coerced to something unintended.
 */
const port = (fallback: number) =>
  z
    .string()
    .regex(/^[1-9]\d{0,4}$/, `must be a port number from 1 to ${MAX_TCP_PORT} in decimal digits (e.g. ${fallback})`)
    .default(String(fallback))
    .transform(Number)
    .pipe(z.number().max(MAX_TCP_PORT, `must be a port number from 1 to ${MAX_TCP_PORT}`));
/** A positive whole number in plain decimal digits (no blank, hexadecimal or exponent forms). */
const wholeNumber = (fallback: number) =>
  z.string().regex(/^[1-9]\d{0,8}$/, 'must be a whole number of 1 or more in decimal digits').default(String(fallback)).transform(Number);
const flag = (fallback: boolean) =>
  z
    .enum(['true', 'false', '1', '0', 'yes', 'no'])
    .default(fallback ? 'true' : 'false')
    .transform((value) => ['true', '1', 'yes'].includes(value));
const identifier = (fallback: string) =>
  z.string().regex(/^[A-Za-z0-9_]{1,32}$/, 'letters, digits and _ only (at most 32)').default(fallback);

/**
 * Every environment variable Kneepoint reads, checked once at start-up.
 * .env.example documents the same list.
 */
export const EnvSchema = z.object({
  KNEEPOINT_MODE: z.enum(['demo', 'development', 'production', 'test']).default('demo'),
  KNEEPOINT_HOST: z
    .string()
    .refine((host) => LOOPBACK_HOSTS.includes(host) || /^127\.\d+\.\d+\.\d+$/.test(host), {
      message: 'must be a loopback address (127.0.0.1, ::1 or localhost); put a reverse proxy in front for other hosts',
    })
    .default('127.0.0.1'),
  KNEEPOINT_PORT: port(8080),
  KNEEPOINT_DATA_DIR: z.string().min(1).default('.data'),
  KNEEPOINT_CLIENT_DIR: z.string().min(1).default('dist/client'),
  KNEEPOINT_DB_PROVISION: flag(true),
  KNEEPOINT_DB_PORT: port(3307).refine((value) => value !== SYSTEM_MARIADB_PORT, {
    message: `must not be ${SYSTEM_MARIADB_PORT} (the system MariaDB's port)`,
  }),
  KNEEPOINT_DB_NAME: identifier('kneepoint'),
  KNEEPOINT_DB_USER: identifier('kneepoint'),
  KNEEPOINT_DB_PASSWORD: z.string().min(12).max(200).optional(),
  SESSION_SECRET: z.string().min(MIN_SECRET_LENGTH, `at least ${MIN_SECRET_LENGTH} characters`).optional(),
  KNEEPOINT_COOKIE_SECURE: flag(false),
  KNEEPOINT_SESSION_HOURS: z.coerce.number().positive().max(24 * 30).default(12),
  KNEEPOINT_BODY_LIMIT: z.string().regex(/^\d+(b|kb|mb)$/, 'such as 512kb or 1mb').default('1mb'),
  KNEEPOINT_LOGIN_MAX_FAILURES: wholeNumber(10),
  KNEEPOINT_TRUST_PROXY: TrustProxySchema,
  KNEEPOINT_ALLOWED_HOSTS: AllowedHostsSchema,
  KNEEPOINT_LOGIN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  KNEEPOINT_DEMO_PASSWORD: z.string().min(10).default('northgate-demo'),
  /** Folder for scheduled backups (database dump and uploaded files); unset = no scheduled backups. */
  KNEEPOINT_BACKUP_DIR: z.string().trim().min(1, 'a folder path, or leave it unset').optional(),
  KNEEPOINT_BACKUP_EVERY_HOURS: z.coerce.number().positive().max(24 * 31).default(24),
  KNEEPOINT_BACKUP_KEEP: z.coerce.number().int().min(1).max(1000).default(7),
});
export type Env = z.infer<typeof EnvSchema>;
