import type { Server } from 'node:http';
import type { AppContext } from '../app-context.js';
import type { DatabaseConfig } from '../config/config.js';
import { createBackup } from './backup-service.js';
import { MS_PER_HOUR } from '../../shared/units/time.js';

/** The last scheduled backup, for the health endpoint. */
export interface BackupStatus {
  dir: string;
  everyHours: number;
  keep: number;
  lastAt: string | null;
  lastPath: string | null;
  lastError: string | null;
}

declare module '../app-context.js' {
  interface AppServices {
    backupStatus: BackupStatus;
  }
}


/**
 * Server attachment: when KNEEPOINT_BACKUP_DIR is set, backs up the database and the uploaded
 * files every KNEEPOINT_BACKUP_EVERY_HOURS (first one after one interval), keeping the newest
 * KNEEPOINT_BACKUP_KEEP. A backup due while the database is away waits for the next interval.
 */
export function backupAttachment(database?: DatabaseConfig) {
  return function attachBackups(_httpServer: Server, ctx: AppContext): (() => Promise<void>) | void {
    const { dir, everyMs, keep } = ctx.config.backup;
    if (!dir) return;
    const db = database ?? ctx.config.db;
    const status: BackupStatus = { dir, everyHours: everyMs / MS_PER_HOUR, keep, lastAt: null, lastPath: null, lastError: null };
    ctx.services.backupStatus = status;
    let running: Promise<void> = Promise.resolve();
    const backUp = async () => {
      if (ctx.services.databaseHealth && !ctx.services.databaseHealth.available()) {
        status.lastError = 'skipped: the database was not available';
        return ctx.log.warn('[backup] skipped: the database is not available; trying again at the next interval');
      }
      try {
        const path = await createBackup({ db, dataDir: ctx.config.dataDir, backupDir: dir, keep });
        Object.assign(status, { lastAt: new Date().toISOString(), lastPath: path, lastError: null });
        ctx.log.info(`[backup] written to ${path}`);
      } catch (err) {
        status.lastError = err instanceof Error ? err.message : String(err);
        ctx.log.error('[backup] failed', err);
      }
    };
    const timer = setInterval(() => (running = running.then(backUp)), everyMs);
    timer.unref();
    return async () => {
      clearInterval(timer);
      await running;
      delete ctx.services.backupStatus;
    };
  };
}
