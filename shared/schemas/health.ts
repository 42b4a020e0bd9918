import { z } from 'zod';

/** The database as GET /api/health reports it (see server/db/database-health.ts). */
export const DatabaseStatusSchema = z.object({
  state: z.enum(['up', 'stalled', 'down', 'restarting', 'unreachable']),
  supervised: z.boolean(),
  since: z.string(),
  restarts: z.number().int().nonnegative(),
  lastRestartAt: z.string().nullable(),
  lastProblem: z.string().nullable(),
});
export type DatabaseStatusBody = z.infer<typeof DatabaseStatusSchema>;

/** Scheduled backups (null when none are configured); the reason of a failure is in the server log only. */
export const BackupHealthSchema = z.object({
  everyHours: z.number().positive(),
  lastAt: z.string().nullable(),
  failing: z.boolean(),
});

/** GET /api/health: 200 when everything answers, 503 (same body) while the database is away. */
export const HealthSchema = z.object({
  ok: z.boolean(),
  database: DatabaseStatusSchema.nullable(),
  backups: BackupHealthSchema.nullable().optional(),
});
export type Health = z.infer<typeof HealthSchema>;
