import type { Logger } from '../log/logger.js';
import { ensureDebianPrograms } from '../system/debian-programs.js';

/** The exact command that installs the MariaDB server and client on Debian. */
export const MARIADB_INSTALL_COMMAND =
  'apt-get update && apt-get install -y --no-install-recommends mariadb-server mariadb-client';

/** Paths of the MariaDB programs the provisioner runs. */
export interface MariaDbBinaries {
  mariadbd: string;
  installDb: string;
  admin: string;
  client: string;
}

/**
 * Finds the MariaDB programs; when missing and we are root on Debian, installs them with
 * apt-get (saying so), otherwise stops with the exact command to run.
 */
export function ensureMariaDbBinaries(log: Logger, allowInstall = true): MariaDbBinaries {
  return ensureDebianPrograms({
    programs: { mariadbd: 'mariadbd', installDb: 'mariadb-install-db', admin: 'mariadb-admin', client: 'mariadb' },
    product: 'MariaDB',
    notFound: 'MariaDB server programs (mariadbd, mariadb-install-db, mariadb-admin, mariadb) were not found.',
    installHint: 'Install them as root with',
    installCommand: MARIADB_INSTALL_COMMAND,
  }, log, allowInstall);
}
