import { Router } from 'express';
import {
  InspectionEntryInputSchema,
  InspectionItemInputSchema,
  InspectionItemPatchSchema,
  type InspectionEntry,
  type InspectionResponse,
} from '../../../shared/schemas/inspection.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { PhotosRepo, toApiPhoto } from '../../photos/photos-repo.js';
import { InspectionRepo } from '../../inspection/inspection-repo.js';

/**
 * The teardown checklist (/api/inspection-items: everyone reads, admins edit) and each pack's
 * inspection (/api/batteries/:id/inspection: everyone reads, technicians rate).
 */
export function createInspectionRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new InspectionRepo(ctx.sequelize);
  const photos = new PhotosRepo(ctx.sequelize);
  const batteryOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    return (await ctx.models.Battery.findByPk(id)) ?? Promise.reject(notFound(`Battery ${id}`));
  };

  router.get('/inspection-items', requireRole('viewer'), async (_req, res) => {
    res.json({ items: await repo.items() });
  });

  router.post('/inspection-items', requireRole('admin'), async (req, res) => {
    const { title, position } = parseBody(InspectionItemInputSchema, req.body);
    res.status(201).json({ item: await repo.addItem(title, position) });
  });

  router.patch('/inspection-items/:id', requireRole('admin'), async (req, res) => {
    const change = parseBody(InspectionItemPatchSchema, req.body);
    const id = parseIdParam(req.params.id);
    if (!(await repo.item(id))) throw notFound(`Checklist item ${id}`);
    res.json({ item: await repo.patchItem(id, change) });
  });

  router.get('/batteries/:id/inspection', requireRole('viewer'), async (req, res) => {
    const battery = await batteryOr404(req.params.id);
    const [items, entries, all] = await Promise.all([repo.items(), repo.entries(battery.id), photos.ofBattery(battery.id)]);
    const byItem = new Map(entries.map((e) => [e.itemId, e]));
    const shown = items.filter((item) => !item.archived || byItem.has(item.id) || all.some((p) => p.itemId === item.id));
    const result: InspectionEntry[] = shown.map((item) => {
      const entry = byItem.get(item.id);
      return {
        item, rating: entry?.rating ?? null, note: entry?.note ?? null, updatedAt: entry?.updatedAt ?? null,
        photos: all.filter((p) => p.itemId === item.id).map(toApiPhoto),
      };
    });
    res.json({ entries: result, otherPhotos: all.filter((p) => p.itemId === null).map(toApiPhoto) } satisfies InspectionResponse);
  });

  router.put('/batteries/:id/inspection/:itemId', requireRole('technician'), async (req, res) => {
    const { rating, note } = parseBody(InspectionEntryInputSchema, req.body);
    const battery = await batteryOr404(req.params.id);
    const itemId = parseIdParam(req.params.itemId, 'itemId');
    const item = await repo.item(itemId);
    if (!item) throw notFound(`Checklist item ${itemId}`);
    if (item.archived) throw new HttpError(409, `Checklist item "${item.title}" is retired; an admin can bring it back`);
    const stored = await repo.rate(battery.id, itemId, rating, note || null, req.user!.id);
    res.json({ entry: { item, rating: stored.rating, note: stored.note, updatedAt: stored.updatedAt } });
  });

  return router;
}
