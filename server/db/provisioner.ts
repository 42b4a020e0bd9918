import { spawn, execFile } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, readdirSync, renameSync, rmSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, dirname, join, resolve } from 'node:path';
import { userInfo } from 'node:os';
import { ensureMariaDbBinaries, type MariaDbBinaries } from './mariadb-binaries.js';
import { liveLeaseHolders, takeLease, withStartStopLock } from './mariadb-lease.js';
import { findRunningMariaDb, isAlive, isPortFree, isStopped, pingOverSocket, stopMariaDb, waitFor } from './mariadb-process.js';
import type { SupervisedServer } from './database-watch.js';
import { SYSTEM_MARIADB_PORT } from '../config/env-schema.js';
import type { DatabaseConfig } from '../config/config.js';
import { createLogger, type Logger } from '../log/logger.js';

/** The provisioner's lines when the caller passes no log of its own. */
const mariadbLog = createLogger('mariadb');

/** What to provision: one private MariaDB per base directory. */
export interface ProvisionOptions {
  /** Folder holding data/, the pid file and the error log, e.g. .data/mariadb. */
  baseDir: string;
  port: number;
  database: string;
  user: string;
  password: string;
  /** Grant the app user every privilege on every database (tests create a database per file). */
  grantAllDatabases?: boolean;
  allowInstall?: boolean;
  readyTimeoutMs?: number;
  /** Where its progress goes (default: the console, as [mariadb]). */
  log?: Logger;
}

/** A running private MariaDB and how to reach it. */
export interface ProvisionedMariaDb extends DatabaseConfig, SupervisedServer {
  socketPath: string;
  pid: number;
  /** True when a healthy server was already running on this data (another user, or left by a crash). */
  reused: boolean;
  /**
   * Drops this process's lease and shuts the server down cleanly when no other live process
   * holds one (so concurrent test runs or app instances on the same data never pull it away).
   */
  stop(): Promise<void>;
}

const MAX_SOCKET_PATH_BYTES = 100; // the kernel limit is 107; keep a margin
const DEFAULT_READY_TIMEOUT_MS = 60_000;
const LOG_TAIL_LINES = 15;

/** A short socket path: beside the data, or in /tmp when the checkout path is long. */
export function socketPathFor(baseDir: string): string {
  const local = join(baseDir, 'm.sock');
  if (Buffer.byteLength(local) <= MAX_SOCKET_PATH_BYTES) return local;
  const digest = createHash('sha1').update(baseDir).digest('hex').slice(0, 12);
  return `/tmp/kneepoint-${digest}.sock`;
}

function tail(file: string): string {
  if (!existsSync(file)) return '(no error log)';
  return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-LOG_TAIL_LINES).join('\n');
}

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;
}

function runSql(bin: MariaDbBinaries, socketPath: string, osUser: string, sql: string): Promise<void> {
  return new Promise((resolvePromise, reject) => {
    // SQL goes in on stdin so the password never shows in the process list.
    const child = execFile(bin.client, ['--no-defaults', `--socket=${socketPath}`, `--user=${osUser}`], (error, _out, stderr) =>
      error ? reject(new Error(`MariaDB setup failed: ${stderr || error.message}`)) : resolvePromise(),
    );
    child.stdin?.end(sql);
  });
}

async function initialiseDataDir(bin: MariaDbBinaries, dataDir: string, osUser: string, log: Logger) {
  // Initialise into a temporary folder and rename it, so a killed init never leaves half a data dir.
  const tempDir = `${dataDir}.init-${process.pid}`;
  // Leftovers of an init that was killed (we hold the start/stop lock, so none is in progress).
  for (const entry of readdirSync(dirname(dataDir))) {
    if (entry.startsWith(`${basename(dataDir)}.init-`)) rmSync(join(dirname(dataDir), entry), { recursive: true, force: true });
  }
  log.info(`Initialising a private MariaDB data directory in ${dataDir}`);
  await new Promise<void>((resolvePromise, reject) => {
    execFile(
      bin.installDb,
      ['--no-defaults', `--datadir=${tempDir}`, `--user=${osUser}`, '--skip-test-db',
        '--auth-root-authentication-method=socket', `--auth-root-socket-user=${osUser}`],
      { timeout: 120_000 },
      (error, _out, stderr) => (error ? reject(new Error(`mariadb-install-db failed: ${stderr || error.message}`)) : resolvePromise()),
    );
  });
  renameSync(tempDir, dataDir);
}

function serverArgs(dataDir: string, socketPath: string, pidFile: string, errorLog: string, port: number, osUser: string) {
  return [
    '--no-defaults', `--user=${osUser}`, `--datadir=${dataDir}`, `--socket=${socketPath}`, `--pid-file=${pidFile}`,
    `--log-error=${errorLog}`, `--port=${port}`, '--bind-address=127.0.0.1', '--skip-networking=0',
    '--skip-name-resolve', '--character-set-server=utf8mb4', '--collation-server=utf8mb4_unicode_ci',
    '--max-allowed-packet=64M',
  ];
}

async function startServerProcess(bin: MariaDbBinaries, opts: Required<Pick<ProvisionOptions, 'port' | 'readyTimeoutMs'>> & {
  dataDir: string; socketPath: string; pidFile: string; errorLog: string; osUser: string;
}): Promise<number> {
  const child = spawn(bin.mariadbd, serverArgs(opts.dataDir, opts.socketPath, opts.pidFile, opts.errorLog, opts.port, opts.osUser), {
    detached: true, // Ctrl-C reaches the app only; the app then stops MariaDB cleanly
    stdio: 'ignore',
  });
  let exitCode: number | null | undefined;
  child.once('exit', (code) => (exitCode = code));
  child.unref();
  const pid = child.pid;
  if (pid === undefined) throw new Error(`Could not start ${bin.mariadbd}`);
  const abort = () => {
    if (exitCode === undefined) return undefined;
    const log = tail(opts.errorLog);
    const portTaken = /Address already in use|Bind on TCP\/IP port/.test(log);
    return new Error(portTaken
      ? `MariaDB port ${opts.port} on 127.0.0.1 is already in use by another program: choose another port (KNEEPOINT_DB_PORT).`
      : `mariadbd exited with code ${exitCode} during start-up. Last lines of ${opts.errorLog}:\n${log}`);
  };
  try {
    await waitFor(() => pingOverSocket(bin.admin, opts.socketPath, opts.osUser), opts.readyTimeoutMs, abort);
  } catch (error) {
    if (isAlive(pid)) await stopMariaDb(pid);
    throw error;
  }
  return pid;
}

async function createDatabaseAndUser(bin: MariaDbBinaries, socketPath: string, osUser: string, options: ProvisionOptions) {
  const { database, user, password } = options;
  for (const [name, value] of [['database', database], ['user', user]]) {
    if (!/^[A-Za-z0-9_]{1,64}$/.test(value)) throw new Error(`Invalid ${name} name "${value}": letters, digits and _ only`);
  }
  const account = `'${user}'@'127.0.0.1'`;
  const scope = options.grantAllDatabases ? '*.*' : `\`${database}\`.*`;
  await runSql(bin, socketPath, osUser, [
    `CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
    `CREATE USER IF NOT EXISTS ${account} IDENTIFIED BY ${sqlString(password)};`,
    `ALTER USER ${account} IDENTIFIED BY ${sqlString(password)};`,
    `GRANT ALL PRIVILEGES ON ${scope} TO ${account};`,
  ].join('\n'));
}

/**
 * Makes a private MariaDB available on 127.0.0.1:port for this base directory: installs the
 * programs if allowed, initialises the data once, starts the server (or reuses a healthy one
 * already running on the same data: processes take leases, the last one out stops it), and
 * creates the database and app user idempotently.
 */
export async function provisionMariaDb(options: ProvisionOptions): Promise<ProvisionedMariaDb> {
  const log = options.log ?? mariadbLog;
  if (options.port === SYSTEM_MARIADB_PORT) throw new Error(`Refusing port ${SYSTEM_MARIADB_PORT}: that is the system MariaDB's port`);
  const bin = ensureMariaDbBinaries(log, options.allowInstall ?? true);
  const baseDir = resolve(options.baseDir);
  const dataDir = join(baseDir, 'data');
  const pidFile = join(baseDir, 'mariadbd.pid');
  const errorLog = join(baseDir, 'mariadbd.err');
  const socketPath = socketPathFor(baseDir);
  const osUser = userInfo().username;
  mkdirSync(baseDir, { recursive: true });

  const readyTimeoutMs = options.readyTimeoutMs ?? DEFAULT_READY_TIMEOUT_MS;
  const start = () => startServerProcess(bin, { dataDir, socketPath, pidFile, errorLog, osUser, port: options.port, readyTimeoutMs });
  const running = () => {
    const found = findRunningMariaDb(dataDir, pidFile);
    return found === undefined ? undefined : { pid: found, stopped: isStopped(found) };
  };
  // The supervisor's restart: the same data, port and socket; another process may have restarted it first.
  const ensureRunning = () => withStartStopLock(baseDir, async () => findRunningMariaDb(dataDir, pidFile) ?? (await start()));

  return withStartStopLock(baseDir, async () => {
    let pid = findRunningMariaDb(dataDir, pidFile);
    const reused = pid !== undefined;
    if (pid !== undefined) {
      if (!(await pingOverSocket(bin.admin, socketPath, osUser))) {
        throw new Error(`A MariaDB server (pid ${pid}) is already running on ${dataDir} but does not answer on ${socketPath}. ` +
          `Stop it first: kill ${pid}`);
      }
      log.info(`Reusing the MariaDB server already running on this data (pid ${pid}); the last process using it stops it.`);
    } else {
      if (!(await isPortFree(options.port))) {
        throw new Error(`MariaDB port ${options.port} on 127.0.0.1 is already in use by another program: choose another port (KNEEPOINT_DB_PORT).`);
      }
      if (!existsSync(join(dataDir, 'mysql'))) await initialiseDataDir(bin, dataDir, osUser, log);
      pid = await start();
      log.info(`MariaDB started on 127.0.0.1:${options.port} (pid ${pid}, data in ${dataDir})`);
    }
    await createDatabaseAndUser(bin, socketPath, osUser, options);
    const dropLease = takeLease(baseDir);
    const stop = () => withStartStopLock(baseDir, async () => {
      dropLease();
      const others = liveLeaseHolders(baseDir);
      if (others.length > 0) return log.info(`MariaDB left running: still used by pid ${[...new Set(others)].join(', ')}`);
      const running = findRunningMariaDb(dataDir, pidFile);
      if (running !== undefined) await stopMariaDb(running);
    });
    return {
      host: '127.0.0.1', port: options.port, database: options.database, user: options.user, password: options.password,
      socketPath, pid: pid!, reused, stop, running, ensureRunning,
    };
  });
}
