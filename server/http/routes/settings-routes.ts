import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../app-context.js';
import { LabSettingsInputSchema } from '../../../shared/schemas/lab-settings.js';
import { requireRole } from '../../auth/guards.js';
import { parseBody } from '../validate.js';
import { getLabSettings, saveLabSettings } from '../../settings/settings-service.js';

const PatchObjectSchema = z.record(z.string(), z.unknown());

/** /api/settings: everyone signed in reads; admins write (PUT replaces, PATCH merges). */
export function createSettingsRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/', requireRole('viewer'), async (_req, res) => {
    res.json({ settings: await getLabSettings(ctx.models) });
  });

  router.put('/', requireRole('admin'), async (req, res) => {
    const settings = parseBody(LabSettingsInputSchema, req.body);
    res.json({ settings: await saveLabSettings(ctx.models, settings, req.user!.id) });
  });

  router.patch('/', requireRole('admin'), async (req, res) => {
    const current = await getLabSettings(ctx.models);
    const change = parseBody(PatchObjectSchema, req.body);
    const endVolts = change.endVoltsPerCell;
    const isObject = typeof endVolts === 'object' && endVolts !== null && !Array.isArray(endVolts);
    // Merge onto the stored document first, then check the whole with the strict schema.
    const merged = parseBody(LabSettingsInputSchema, {
      ...current,
      ...change,
      endVoltsPerCell: isObject ? { ...current.endVoltsPerCell, ...endVolts } : (endVolts ?? current.endVoltsPerCell),
    });
    res.json({ settings: await saveLabSettings(ctx.models, merged, req.user!.id) });
  });

  return router;
}
