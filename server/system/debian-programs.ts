import { accessSync, constants, existsSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { delimiter, join } from 'node:path';
import type { Logger } from '../log/logger.js';

/** Where Debian puts daemons (/usr/sbin is not on an ordinary user's PATH) and local installs. */
const EXTRA_BIN_DIRS = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin'];

/** The full path of an executable program on PATH or in the system's bin folders, else undefined. */
export function findProgram(name: string): string | undefined {
  for (const dir of [...(process.env.PATH ?? '').split(delimiter), ...EXTRA_BIN_DIRS]) {
    const candidate = join(dir, name);
    try {
      accessSync(candidate, constants.X_OK);
      return candidate;
    } catch {
      // not here; try the next directory
    }
  }
  return undefined;
}

/** A set of programs a Debian package provides, and how to say they are missing. */
export interface DebianPrograms<K extends string> {
  /** Each program's key and its file name, e.g. { mosquitto: 'mosquitto' }. */
  programs: Record<K, string>;
  /** What is installed, as the warning names it: "MariaDB". */
  product: string;
  /** The error's first line when they are missing and cannot be installed here. */
  notFound: string;
  /** The pronoun of the install hint: "Install them as root with" or "Install it …". */
  installHint: string;
  /** The exact apt-get command that installs them. */
  installCommand: string;
}

function findAll<K extends string>(programs: Record<K, string>): Record<K, string> | undefined {
  const found = {} as Record<K, string>;
  for (const key of Object.keys(programs) as K[]) {
    const path = findProgram(programs[key]);
    if (!path) return undefined;
    found[key] = path;
  }
  return found;
}

/**
 * Finds the programs; when one is missing and we are root on Debian, installs them with
 * apt-get (saying so), otherwise stops with the exact command to run.
 */
export function ensureDebianPrograms<K extends string>(want: DebianPrograms<K>, log: Logger, allowInstall = true): Record<K, string> {
  const found = findAll(want.programs);
  if (found) return found;
  if (!allowInstall || process.getuid?.() !== 0 || !existsSync('/etc/debian_version'))
    throw new Error(`${want.notFound}\n${want.installHint}:\n  ${want.installCommand}`);
  log.warn(`${want.product} is not installed: installing it now with\n  ${want.installCommand}`);
  execFileSync('sh', ['-c', want.installCommand], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  const installed = findAll(want.programs);
  if (!installed) throw new Error(`${want.product} still missing after: ${want.installCommand}`);
  return installed;
}
