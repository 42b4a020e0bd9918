import { Router, type ErrorRequestHandler, type Request } from 'express';
import { MarkReadyRequestSchema, SignRequestSchema } from '../../../shared/schemas/signoff.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { SignoffError, SignoffService, type RunReview } from '../../signoff/signoff-service.js';

const STATUS_OF: Record<SignoffError['reason'], number> = { 'no-run': 404, live: 409, 'not-ready': 409, changed: 409, already: 409 };

const reviewBody = (review: RunReview) => ({ status: review.status, currentHash: review.currentHash, entries: review.entries });

/** /api/runs/:id/signoffs: viewers read the history; technicians mark ready; admins sign. */
export function createSignoffRouter(ctx: AppContext): Router {
  const router = Router();
  const service = new SignoffService(ctx.sequelize);
  const author = (req: Request) => ({ id: req.user!.id, name: req.user!.name, role: req.user!.role });

  router.get('/runs/:id/signoffs', requireRole('viewer'), async (req, res) => {
    res.json(reviewBody(await service.review(parseIdParam(req.params.id))));
  });

  router.get('/runs/:id/signoffs/:signoffId', requireRole('viewer'), async (req, res) => {
    const runId = parseIdParam(req.params.id);
    const found = await service.entry(runId, parseIdParam(req.params.signoffId, 'signoffId'));
    if (!found) throw notFound('Sign-off');
    res.json(found);
  });

  router.post('/runs/:id/signoffs/ready', requireRole('technician'), async (req, res) => {
    const { comment } = parseBody(MarkReadyRequestSchema, req.body);
    res.status(201).json(reviewBody(await service.markReady(parseIdParam(req.params.id), comment, author(req))));
  });

  router.post('/runs/:id/signoffs', requireRole('admin'), async (req, res) => {
    const { comment, contentHash } = parseBody(SignRequestSchema, req.body);
    res.status(201).json(reviewBody(await service.sign(parseIdParam(req.params.id), comment, contentHash, author(req))));
  });

  const mapErrors: ErrorRequestHandler = (error, _req, _res, next) => {
    next(error instanceof SignoffError ? new HttpError(STATUS_OF[error.reason], error.message) : error);
  };
  router.use(mapErrors);
  return router;
}
