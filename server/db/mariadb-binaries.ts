import { accessSync, constants, existsSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { delimiter, join } from 'node:path';
import type { Logger } from '../log/logger.js';

/** The exact command that installs the MariaDB server and client on Debian. */
export const MARIADB_INSTALL_COMMAND =
  'apt-get update && apt-get install -y --no-install-recommends mariadb-server mariadb-client';

const EXTRA_BIN_DIRS = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin'];

/** Paths of the MariaDB programs the provisioner runs. */
export interface MariaDbBinaries {
  mariadbd: string;
  installDb: string;
  admin: string;
  client: string;
}

function which(name: string): string | undefined {
  // mariadbd lives in /usr/sbin, which is not on an ordinary user's PATH.
  const dirs = [...(process.env.PATH ?? '').split(delimiter), ...EXTRA_BIN_DIRS];
  for (const dir of dirs) {
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

function findBinaries(): MariaDbBinaries | undefined {
  const mariadbd = which('mariadbd');
  const installDb = which('mariadb-install-db');
  const admin = which('mariadb-admin');
  const client = which('mariadb');
  if (!mariadbd || !installDb || !admin || !client) return undefined;
  return { mariadbd, installDb, admin, client };
}

/**
 * Finds the MariaDB programs; when missing and we are root on Debian, installs them with
 * apt-get (saying so), otherwise stops with the exact command to run.
 */
export function ensureMariaDbBinaries(log: Logger, allowInstall = true): MariaDbBinaries {
  const found = findBinaries();
  if (found) return found;
  const isRoot = process.getuid?.() === 0;
  const isDebian = existsSync('/etc/debian_version');
  if (!allowInstall || !isRoot || !isDebian) {
    throw new Error(
      `MariaDB server programs (mariadbd, mariadb-install-db, mariadb-admin, mariadb) were not found.\n` +
        `Install them as root with:\n  ${MARIADB_INSTALL_COMMAND}`,
    );
  }
  log.warn(`MariaDB is not installed: installing it now with\n  ${MARIADB_INSTALL_COMMAND}`);
  execFileSync('sh', ['-c', MARIADB_INSTALL_COMMAND], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  const installed = findBinaries();
  if (!installed) throw new Error(`MariaDB still missing after: ${MARIADB_INSTALL_COMMAND}`);
  return installed;
}
