import { mkdirSync } from 'node:fs';
import { unlink } from 'node:fs/promises';
import { join } from 'node:path';
import type { RequestHandler } from 'express';
import multer from 'multer';
import type { z } from 'zod';
import { ImportColumnMapSchema, ImportFieldsSchema, RunTagsSchema, type ImportProgress } from '../../../shared/schemas/api-runs.js';
import type { AppContext } from '../../app-context.js';
import { HttpError } from '../http-error.js';
import { getLabSettings } from '../../settings/settings-service.js';
import type { ImportProgressBoard } from '../../runs/import-progress.js';
import { importRun } from '../../runs/import-service.js';
import type { BatteryFacts } from '../../runs/measure-config.js';
import type { RunsRepo } from '../../runs/runs-repo.js';

/** Largest log accepted: a million rows of a wide logger fit well below this. */
export const IMPORT_MAX_BYTES = 512 * 1024 * 1024;

/**
 * POST /api/runs/import: multer writes the upload to disk under the data folder (never
 * into memory), then the importer streams it twice. The temporary file always goes.
 */
export function createImportHandler(ctx: AppContext, repo: RunsRepo, getBattery: (id: number) => Promise<BatteryFacts | null>, progress?: ImportProgressBoard): RequestHandler {
  const dir = join(ctx.config.dataDir, 'uploads');
  mkdirSync(dir, { recursive: true });
  const upload = multer({ dest: dir, limits: { fileSize: IMPORT_MAX_BYTES, files: 1, fields: 20 } }).single('file');
  return (req, res, next) => {
    upload(req, res, (uploadError: unknown) => {
      const file = req.file;
      const done = (err?: unknown) => {
        if (file) void unlink(file.path).catch(() => undefined);
        next(err);
      };
      if (uploadError) {
        const e = uploadError as { code?: string; message?: string };
        return done(new HttpError(e.code === 'LIMIT_FILE_SIZE' ? 413 : 400, `Upload refused: ${e.message ?? 'bad multipart body'}`));
      }
      void (async () => {
        if (!file) throw new HttpError(400, 'No file: send the CSV as the multipart field "file"', { file: ['required'] });
        const fields = ImportFieldsSchema.parse(req.body);
        let columns: z.infer<typeof ImportColumnMapSchema> = {};
        if (fields.columns) {
          try {
            columns = ImportColumnMapSchema.parse(JSON.parse(fields.columns));
          } catch {
            throw new HttpError(400, 'columns must be JSON such as {"time":"Elapsed","volts":"U","amps":"I"}', { columns: ['invalid mapping'] });
          }
        }
        const battery = fields.batteryId ? await getBattery(fields.batteryId) : null;
        if (fields.batteryId && !battery) throw new HttpError(400, `Battery ${fields.batteryId} does not exist`, { batteryId: ['no such battery'] });
        // The same limits as a rename: a run the API answers must pass RunSchema on the client.
        const split = RunTagsSchema.safeParse((fields.tags ?? '').split(',').map((t) => t.trim()).filter(Boolean));
        if (!split.success) throw new HttpError(400, 'tags: at most 30, each 1 to 50 characters, comma-separated', { tags: split.error.issues.map((i) => i.message) });
        const tags = split.data;
        const lab = await getLabSettings(ctx.models);
        const { timeUnit, ...names } = columns;
        const userId = req.user!.id;
        const { progressId } = fields;
        const follow = progress && progressId ? (p: ImportProgress) => progress.set(userId, progressId, p) : undefined;
        follow?.({ phase: 'checking', rows: 0, totalRows: null });
        const result = await importRun(ctx.sequelize, repo, {
          filePath: file.path, name: fields.name, tags, battery, endVolts: fields.endVolts,
          currentSign: fields.currentSign, userId: req.user!.id, timeZone: lab.timeZone,
          columns: { ...names, timeFormat: fields.timeFormat ?? timeUnit, tempUnit: fields.tempUnit, labTempUnit: lab.temperatureUnit },
          acceptancePercent: fields.acceptancePercent ?? lab.acceptancePercent,
          electrolyteTempCelsius: fields.electrolyteTempCelsius, maxGapSeconds: fields.maxGapSeconds, onProgress: follow,
        }).finally(() => {
          if (progressId) progress?.delete(userId, progressId);
        });
        if (file) await unlink(file.path).catch(() => undefined);
        res.status(201).json(result);
      })().catch(done);
    });
  };
}
