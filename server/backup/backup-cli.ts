/**
 * `npm run backup` makes one backup now; `npm run restore -- <backup folder>` restores one
 * (stop Kneepoint first). Both read the same environment as the server (KNEEPOINT_DATA_DIR,
 * KNEEPOINT_DB_*, KNEEPOINT_BACKUP_*) and start the private MariaDB when it is not running.
 */
import { resolve } from 'node:path';
import { loadConfig, type AppConfig, type DatabaseConfig } from '../config/config.js';
import { liveLeaseHolders } from '../db/mariadb-lease.js';
import { provisionMariaDb, type ProvisionedMariaDb } from '../db/provisioner.js';
import { createBackup, listBackups, readManifest, restoreBackup } from './backup-service.js';
import { createLogger } from '../log/logger.js';

const USAGE = 'usage: npm run backup [-- <folder>]   |   npm run restore -- <backup folder>';

async function openDatabase(config: AppConfig): Promise<{ db: DatabaseConfig; mariadb?: ProvisionedMariaDb }> {
  if (!config.db.provision) return { db: config.db };
  const mariadb = await provisionMariaDb({
    baseDir: config.db.mariadbDir, port: config.db.port, database: config.db.database, user: config.db.user, password: config.db.password,
    log: createLogger('mariadb'),
  });
  return { db: mariadb, mariadb };
}

async function main(): Promise<void> {
  const [command, target] = process.argv.slice(2);
  const config = loadConfig();
  if (command === 'restore') {
    if (!target) throw new Error(`Name the backup folder to restore.\n${USAGE}`);
    readManifest(resolve(target)); // a wrong folder is refused before anything starts
    const others = config.db.provision ? liveLeaseHolders(config.db.mariadbDir).filter((pid) => pid !== process.pid) : [];
    if (others.length > 0) throw new Error(`Kneepoint is still running (pid ${others.join(', ')}): stop it first, then restore.`);
    const { db, mariadb } = await openDatabase(config);
    try {
      const manifest = await restoreBackup({ db, dataDir: config.dataDir, backupPath: resolve(target) });
      console.log(`Restored the backup of ${manifest.createdAt} into database ${db.database} and ${config.dataDir}. Start Kneepoint again with npm start.`);
    } finally {
      await mariadb?.stop();
    }
    return;
  }
  if (command === 'create') {
    const dir = target ? resolve(target) : config.backup.dir;
    if (!dir) throw new Error(`Set KNEEPOINT_BACKUP_DIR or name a folder.\n${USAGE}`);
    const { db, mariadb } = await openDatabase(config);
    try {
      const path = await createBackup({ db, dataDir: config.dataDir, backupDir: dir, keep: config.backup.keep });
      console.log(`Backup written to ${path} (keeping the newest ${config.backup.keep}: ${listBackups(dir).length} now).`);
    } finally {
      await mariadb?.stop();
    }
    return;
  }
  throw new Error(USAGE);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
