import { spawn } from 'node:child_process';
import { createReadStream, createWriteStream, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, cpSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { Readable, type Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createGunzip, createGzip } from 'node:zlib';
import type { DatabaseConfig } from '../config/config.js';

/** Folders under the data directory that a backup copies beside the database dump. */
export const BACKED_UP_FOLDERS = [
  'uploads', // files people upload and keep (photos, documents)
  'attachments', // the same, for areas that name their folder so
  'spill', // readings batches still waiting for the database when the backup ran
] as const;

/** An import's upload in transit (multer's random 32-hex name at the top of uploads/): its readings end up in the database. */
const IN_TRANSIT_UPLOAD = /^[0-9a-f]{32}$/;

/** False for files that are not worth keeping: imports still being read. */
function worthKeeping(folderPath: string, path: string): boolean {
  return !(dirname(path) === folderPath && IN_TRANSIT_UPLOAD.test(basename(path)));
}

/** Backup folders are named kneepoint-<UTC time>; the name sorts by age. */
const NAME_PREFIX = 'kneepoint-';
const PARTIAL_SUFFIX = '.partial';
const DUMP_FILE = 'database.sql.gz';
const MANIFEST_FILE = 'manifest.json';
const FILES_FOLDER = 'files';
const MANIFEST_VERSION = 1;

/** What a backup holds, written last (a folder without it is not a backup). */
export interface BackupManifest {
  version: number;
  createdAt: string;
  database: string;
  dumpBytes: number;
  folders: string[];
}

/** Where and what to back up. */
export interface BackupOptions {
  db: DatabaseConfig;
  dataDir: string;
  backupDir: string;
  /** How many backups to keep (older ones are removed after a successful backup). */
  keep: number;
  now?: () => Date;
  /** The dump program (Debian's mariadb-client); default `mariadb-dump` on PATH. */
  dumpCommand?: string;
}

/** Runs a MariaDB client program with the password in its environment (never on the command line). */
function runClient(
  command: string,
  args: string[],
  db: DatabaseConfig,
  io: { feed?: (stdin: Writable) => Promise<void>; drain?: (stdout: Readable) => Promise<void> },
): Promise<void> {
  return new Promise((ok, fail) => {
    const child = spawn(command, ['--no-defaults', '--host=127.0.0.1', `--port=${db.port}`, `--user=${db.user}`, '--default-character-set=utf8mb4', ...args], {
      env: { ...process.env, MYSQL_PWD: db.password },
      stdio: [io.feed ? 'pipe' : 'ignore', io.drain ? 'pipe' : 'ignore', 'pipe'],
    });
    let stderr = '';
    child.stderr!.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    child.once('error', (err) => fail(new Error(`cannot run ${command} (apt-get install mariadb-client): ${err.message}`)));
    const piped: Promise<unknown>[] = [];
    if (io.feed) piped.push(io.feed(child.stdin!));
    if (io.drain) piped.push(io.drain(child.stdout!));
    child.once('close', (code) => {
      Promise.all(piped).then(
        () => (code === 0 ? ok() : fail(new Error(`${command} exited with code ${code}: ${stderr.trim()}`))),
        (err: unknown) => fail(code === 0 ? err : new Error(`${command} exited with code ${code}: ${stderr.trim()}`)),
      );
    });
  });
}

function backupName(at: Date): string {
  return NAME_PREFIX + at.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
}

/** The finished backups in `backupDir`, oldest first. */
export function listBackups(backupDir: string): string[] {
  if (!existsSync(backupDir)) return [];
  return readdirSync(backupDir)
    .filter((name) => name.startsWith(NAME_PREFIX) && !name.endsWith(PARTIAL_SUFFIX) && existsSync(join(backupDir, name, MANIFEST_FILE)))
    .sort()
    .map((name) => join(backupDir, name));
}

/**
 * Makes one backup: a consistent dump of the database (mariadb-dump --single-transaction)
 * gzip'd, and a copy of BACKED_UP_FOLDERS, in a folder written under a temporary name and
 * renamed when complete; then removes all but the newest `keep` backups. Returns its path.
 */
export async function createBackup(opts: BackupOptions): Promise<string> {
  const backupDir = resolve(opts.backupDir);
  mkdirSync(backupDir, { recursive: true });
  let name = backupName((opts.now ?? (() => new Date()))());
  for (let n = 2; existsSync(join(backupDir, name)); n++) name = `${backupName((opts.now ?? (() => new Date()))())}-${n}`;
  const partial = join(backupDir, name + PARTIAL_SUFFIX);
  rmSync(partial, { recursive: true, force: true });
  mkdirSync(partial);
  try {
    await runClient(opts.dumpCommand ?? 'mariadb-dump', [
      '--single-transaction', '--quick', '--hex-blob', '--routines', '--triggers', '--skip-lock-tables', opts.db.database,
    ], opts.db, { drain: (out) => pipeline(out, createGzip(), createWriteStream(join(partial, DUMP_FILE))) });
    const folders: string[] = [];
    for (const folder of BACKED_UP_FOLDERS) {
      const from = join(opts.dataDir, folder);
      if (!existsSync(from)) continue;
      cpSync(from, join(partial, FILES_FOLDER, folder), { recursive: true, filter: (path) => worthKeeping(from, path) });
      folders.push(folder);
    }
    const manifest: BackupManifest = {
      version: MANIFEST_VERSION,
      createdAt: new Date().toISOString(),
      database: opts.db.database,
      dumpBytes: statSync(join(partial, DUMP_FILE)).size,
      folders,
    };
    writeFileSync(join(partial, MANIFEST_FILE), JSON.stringify(manifest, null, 2));
    renameSync(partial, join(backupDir, name));
  } catch (err) {
    rmSync(partial, { recursive: true, force: true });
    throw err;
  }
  for (const old of listBackups(backupDir).slice(0, -opts.keep)) rmSync(old, { recursive: true, force: true });
  return join(backupDir, name);
}

/** Reads and checks a backup's manifest; throws a clear error for a folder that is not one. */
export function readManifest(backupPath: string): BackupManifest {
  const file = join(backupPath, MANIFEST_FILE);
  if (!existsSync(file) || !existsSync(join(backupPath, DUMP_FILE))) {
    throw new Error(`${backupPath} is not a complete Kneepoint backup (no ${MANIFEST_FILE} or ${DUMP_FILE})`);
  }
  const manifest = JSON.parse(readFileSync(file, 'utf8')) as BackupManifest;
  if (manifest.version !== MANIFEST_VERSION) throw new Error(`${backupPath}: backup format ${manifest.version} is not known to this version`);
  return manifest;
}

/** Where to restore to. The server must be stopped: restore replaces the database and the copied folders. */
export interface RestoreOptions {
  db: DatabaseConfig;
  dataDir: string;
  backupPath: string;
  clientCommand?: string;
}

/**
 * Restores a backup: empties the database (drops and creates it again), loads the dump into
 * it with the mariadb client, and puts the copied folders back in the data directory in
 * place of the current ones.
 */
export async function restoreBackup(opts: RestoreOptions): Promise<BackupManifest> {
  const backupPath = resolve(opts.backupPath);
  const manifest = readManifest(backupPath);
  const client = opts.clientCommand ?? 'mariadb';
  const name = opts.db.database;
  if (!/^[A-Za-z0-9_]{1,64}$/.test(name)) throw new Error(`Invalid database name "${name}"`);
  const sql = `DROP DATABASE IF EXISTS \`${name}\`;\nCREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;\n`;
  await runClient(client, [], opts.db, { feed: (stdin) => pipeline(Readable.from([sql]), stdin) });
  await runClient(client, [name], opts.db, { feed: (stdin) => pipeline(createReadStream(join(backupPath, DUMP_FILE)), createGunzip(), stdin) });
  for (const folder of BACKED_UP_FOLDERS) {
    const target = join(opts.dataDir, folder);
    rmSync(target, { recursive: true, force: true });
    if (manifest.folders.includes(folder)) cpSync(join(backupPath, FILES_FOLDER, folder), target, { recursive: true });
  }
  return manifest;
}
