import { basename } from 'node:path';
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { PhotoUploadFieldsSchema } from '../../../shared/schemas/inspection.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseIdParam } from '../validate.js';
import { InspectionRepo } from '../../inspection/inspection-repo.js';
import { PHOTO_CONTENT_TYPE, PHOTO_VARIANTS, PhotoFiles, variantFormat, type PhotoVariant } from '../../photos/photo-files.js';
import { displayFileName } from '../../photos/photo-name.js';
import { PhotoRejectedError, processPhoto } from '../../photos/photo-processing.js';
import { PhotosRepo, toApiPhoto } from '../../photos/photos-repo.js';

/** Largest photo accepted, bytes (20 MB). */
export const PHOTO_MAX_BYTES = 20 * 1024 * 1024;
/** Multipart text fields allowed beside the file (only `item` is read). */
const MAX_FIELDS = 4;
/** Browsers may keep a photo's copies for an hour; `private` keeps shared caches out. */
const PHOTO_CACHE_CONTROL = 'private, max-age=3600';

/** Maps multer's refusal to a status: too large → 413, anything else malformed → 400. */
function uploadRefusal(error: unknown): HttpError {
  const e = error as { code?: string; message?: string };
  if (e.code === 'LIMIT_FILE_SIZE') return new HttpError(413, `Photo too large: at most ${PHOTO_MAX_BYTES / 1024 / 1024} MB`);
  return new HttpError(400, `Upload refused: ${e.message ?? 'bad multipart body'}`);
}

/**
 * Teardown photos. Uploads are held in memory (at most 20 MB) and checked before anything is
 * written; the copies go to disk under random names, then the row; a failure at either step
 * removes what was written. Everyone signed in sees them; technicians upload; the author or an
 * admin deletes.
 */
export function createPhotosRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new PhotosRepo(ctx.sequelize);
  const items = new InspectionRepo(ctx.sequelize);
  const files = new PhotoFiles(ctx.config.dataDir);
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: PHOTO_MAX_BYTES, files: 1, fields: MAX_FIELDS } }).single('file');
  const receive: RequestHandler = (req, res, next) => upload(req, res, (error: unknown) => next(error ? uploadRefusal(error) : undefined));
  const photoOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    return (await repo.get(id)) ?? Promise.reject(notFound(`Photo ${id}`));
  };

  router.post('/batteries/:id/photos', requireRole('technician'), receive, async (req, res) => {
    const batteryId = parseIdParam(req.params.id);
    if (!(await ctx.models.Battery.findByPk(batteryId))) throw notFound(`Battery ${batteryId}`);
    if (!req.file) throw new HttpError(400, 'No file: send the photo as the multipart field "file"', { file: ['required'] });
    const { item } = PhotoUploadFieldsSchema.parse(req.body ?? {});
    if (item !== undefined) {
      const found = await items.item(item);
      if (!found || found.archived) throw new HttpError(400, `Checklist item ${item} does not exist or is retired`, { item: ['no such checklist item'] });
    }
    let photo;
    try {
      photo = await processPhoto(req.file.buffer);
    } catch (error) {
      if (error instanceof PhotoRejectedError) throw new HttpError(400, error.message, { file: [error.reason] });
      throw error;
    }
    const storageKey = files.newKey();
    await files.write(storageKey, photo);
    try {
      const stored = await repo.insert({
        batteryId, itemId: item ?? null, storageKey, fileName: displayFileName(req.file.originalname), format: photo.format,
        widthPx: photo.widthPx, heightPx: photo.heightPx, bytes: photo.full.length, createdBy: req.user!.id,
      });
      res.status(201).json({ photo: toApiPhoto(stored) });
    } catch (error) {
      await files.remove(storageKey, photo.format);
      throw error;
    }
  });

  router.get('/batteries/:id/photos', requireRole('viewer'), async (req, res) => {
    const batteryId = parseIdParam(req.params.id);
    if (!(await ctx.models.Battery.findByPk(batteryId))) throw notFound(`Battery ${batteryId}`);
    res.json({ photos: (await repo.ofBattery(batteryId)).map(toApiPhoto) });
  });

  router.get('/photos/:id/:variant', requireRole('viewer'), async (req, res) => {
    const variant = String(req.params.variant) as PhotoVariant;
    if (!PHOTO_VARIANTS.includes(variant)) throw new HttpError(404, `No photo copy "${variant}" (thumb, web or full)`);
    const photo = await photoOr404(req.params.id);
    res.setHeader('Cache-Control', PHOTO_CACHE_CONTROL);
    res.type(PHOTO_CONTENT_TYPE[variantFormat(variant, photo.format)]);
    await new Promise<void>((resolve, reject) => {
      // Relative to the photo folder as root: the data folder itself may sit under a dot folder
      // (.data), which send refuses as a "dotfile" when it is part of the served path.
      const name = basename(files.pathOf(photo.storageKey, variant, photo.format));
      res.sendFile(name, { root: files.dir }, (error) => (error ? reject(error) : resolve()));
    }).catch((error: unknown) => {
      throw (error as { code?: string }).code === 'ENOENT' ? new HttpError(410, `The file of photo ${photo.id} is missing from the data folder`) : error;
    });
  });

  router.delete('/photos/:id', requireRole('technician'), async (req, res) => {
    const photo = await photoOr404(req.params.id);
    if (req.user!.role !== 'admin' && photo.createdBy !== req.user!.id) throw new HttpError(403, 'Only the photo\'s author or an admin may delete it');
    await repo.remove(photo.id);
    await files.remove(photo.storageKey, photo.format);
    res.status(204).end();
  });

  return router;
}
