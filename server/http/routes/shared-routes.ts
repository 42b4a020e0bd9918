import { Router, type Request, type Response } from 'express';
import { ReadingsQuerySchema } from '../../../shared/schemas/api-runs.js';
import type { ShareOpeningWhat } from '../../../shared/schemas/share.js';
import type { AppContext } from '../../app-context.js';
import { HttpError } from '../http-error.js';
import { parseIdParam } from '../validate.js';
import { PhotoFiles } from '../../photos/photo-files.js';
import { PhotosRepo } from '../../photos/photos-repo.js';
import { packReportPdf } from '../../reports/pack-report.js';
import { runReportPdf } from '../../reports/run-report.js';
import { RunsRepo } from '../../runs/runs-repo.js';
import { runReadings } from '../../runs/readings-service.js';
import { ShareRepo, type ActiveLink } from '../../share/share-repo.js';
import { addressHash, isShareToken, shareTokenHash } from '../../share/share-token.js';
import { sharedPackReport, sharedRunReport } from '../../share/shared-reports.js';

/** Longest user agent kept in the openings log. */
const USER_AGENT_MAX_CHARS = 400;
/** One answer for unknown, expired and revoked links alike: it tells nothing about which. */
const GONE_MESSAGE = 'This shared report does not exist or is no longer shared';

const gone = () => new HttpError(404, GONE_MESSAGE);

/**
 * /api/shared/:token: the public, read-only face of one share link. Mounted before the session,
 * so no account and no cookie count here; each route reaches only the link's own run or pack,
 * and anything else under /api/shared answers 404 (nothing falls through to the signed-in API).
 */
export function createSharedRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new ShareRepo(ctx.sequelize);
  const photos = new PhotosRepo(ctx.sequelize);
  const runs = new RunsRepo(ctx.sequelize);
  const files = new PhotoFiles(ctx.config.dataDir);
  const deps = { sequelize: ctx.sequelize, models: ctx.models };
  const linkOf = async (req: Request): Promise<ActiveLink> => {
    const token = String(req.params.token ?? '');
    if (!isShareToken(token)) throw gone();
    return (await repo.active(shareTokenHash(token))) ?? Promise.reject(gone());
  };

  const logOpening = (req: Request, link: ActiveLink, what: ShareOpeningWhat) =>
    repo.logOpening(link.id, addressHash(req.ip ?? '', ctx.config.sessionSecret), String(req.get('user-agent') ?? '').slice(0, USER_AGENT_MAX_CHARS), what);

  router.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('X-Robots-Tag', 'noindex, nofollow');
    next();
  });

  router.get('/:token', async (req, res) => {
    const link = await linkOf(req);
    const report = link.kind === 'run' ? await sharedRunReport(deps, link) : await sharedPackReport(deps, link);
    if (!report) throw gone();
    await logOpening(req, link, 'page');
    res.json({ report });
  });

  // `/samples` is the old address of the same history, kept for old clients. vocab-rename: keep
  const sharedReadings = async (req: Request, res: Response) => {
    const link = await linkOf(req);
    if (link.kind !== 'run') throw gone();
    res.json(await runReadings(ctx.sequelize, link.targetId, ReadingsQuerySchema.parse(req.query)));
  };
  router.get('/:token/readings', sharedReadings);
  router.get('/:token/samples', sharedReadings);

  // The report as a PDF: the run's (with its sign-off block) or the pack's (its price only when the link says so).
  router.get('/:token/report.pdf', async (req, res) => {
    const link = await linkOf(req);
    const madeAt = new Date();
    const run = link.kind === 'run' ? await runs.get(link.targetId) : null;
    const pdf = link.kind === 'run'
      ? run && (await runReportPdf(deps, run, madeAt))
      : await packReportPdf({ ...deps, dataDir: ctx.config.dataDir }, link.targetId, link.includePrices, madeAt);
    if (!pdf) throw gone();
    await logOpening(req, link, 'pdf');
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="${link.kind === 'run' ? 'run' : 'pack'}-${link.targetId}-report.pdf"`);
    res.end(pdf);
  });

  router.get('/:token/photos/:photoId/thumb', async (req, res) => {
    const link = await linkOf(req);
    const photo = link.kind === 'battery' ? await photos.get(parseIdParam(req.params.photoId, 'photoId')) : null;
    if (!photo || photo.batteryId !== link.targetId) throw gone();
    res.type('image/jpeg');
    await new Promise<void>((resolve, reject) => {
      // The data folder is often a dot folder (`.data`): send refuses such paths unless told; the name itself is a checked hex key.
      res.sendFile(files.pathOf(photo.storageKey, 'thumb', photo.format), { dotfiles: 'allow' }, (error) => (error ? reject(error) : resolve()));
    }).catch(() => {
      throw new HttpError(410, 'The picture is missing');
    });
  });

  router.use((_req, _res, next) => next(gone()));
  return router;
}
