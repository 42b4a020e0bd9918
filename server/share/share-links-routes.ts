import { Router } from 'express';
import { CreateShareLinkRequestSchema, ShareTargetKindSchema, type ShareTargetKind } from '../../shared/schemas/share.js';
import type { AppContext } from '../app-context.js';
import { requireRole } from '../auth/guards.js';
import { HttpError, notFound } from '../http/http-error.js';
import { parseBody, parseIdParam } from '../http/validate.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { ShareRepo } from './share-repo.js';
import { newShareToken, shareTokenHash } from './share-token.js';

const DAY_MS = 86_400_000;

/** The client route a token opens (never logged, never stored). */
export const sharedPagePath = (token: string) => `/s/${token}`;

/** /api/share-links: technicians and admins make, list and revoke links to a run's or a pack's report. */
export function createShareLinksRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new ShareRepo(ctx.sequelize);
  const runs = new RunsRepo(ctx.sequelize);
  const targetExists = async (kind: ShareTargetKind, id: number) =>
    kind === 'run' ? (await runs.get(id)) !== null : (await ctx.models.Battery.findByPk(id)) !== null;
  const linkOr404 = async (raw: string | string[] | undefined) => {
    const id = parseIdParam(raw);
    return (await repo.get(id)) ?? Promise.reject(notFound(`Share link ${id}`));
  };

  router.post('/', requireRole('technician'), async (req, res) => {
    const body = parseBody(CreateShareLinkRequestSchema, req.body);
    if (!(await targetExists(body.kind, body.targetId))) throw notFound(`${body.kind === 'run' ? 'Run' : 'Battery'} ${body.targetId}`);
    const token = newShareToken();
    const link = await repo.create({
      tokenHash: shareTokenHash(token),
      kind: body.kind,
      targetId: body.targetId,
      includePrices: body.includePrices,
      recipient: body.recipient || null,
      createdById: req.user!.id,
      createdByName: req.user!.name,
      expiresAt: new Date(Date.now() + body.expiresInDays * DAY_MS),
    });
    res.setHeader('Cache-Control', 'no-store');
    res.status(201).json({ link, token, path: sharedPagePath(token) });
  });

  router.get('/', requireRole('technician'), async (req, res) => {
    const kind = ShareTargetKindSchema.safeParse(req.query.kind);
    if (!kind.success) throw new HttpError(400, 'Give kind=run or kind=battery', { kind: ['run or battery'] });
    res.json({ links: await repo.ofTarget(kind.data, parseIdParam(String(req.query.targetId ?? ''), 'targetId')) });
  });

  router.get('/:id/openings', requireRole('technician'), async (req, res) => {
    const link = await linkOr404(req.params.id);
    res.json({ openings: await repo.openings(link.id) });
  });

  router.post('/:id/revoke', requireRole('technician'), async (req, res) => {
    const link = await linkOr404(req.params.id);
    res.json({ link: await repo.revoke(link.id, req.user!.name) });
  });

  return router;
}
