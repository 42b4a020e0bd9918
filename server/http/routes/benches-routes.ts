import { Router } from 'express';
import { CreateBenchRequestSchema, UpdateBenchRequestSchema } from '../../../shared/schemas/bench.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { benchManagerOf } from '../../benches/bench-services.js';
import { createBenchService, withStatus } from '../../benches/bench-service.js';
import { listSerialPorts } from '../../benches/list-serial-ports.js';
import { assertNoLiveRun } from '../../benches/live-run-guard.js';

/** /api/benches: everyone signed in reads benches with live status; admins configure them. */
export function createBenchesRouter(ctx: AppContext): Router {
  const router = Router();
  const manager = () => benchManagerOf(ctx);
  const service = createBenchService(ctx.sequelize, manager);
  const findOr404 = async (id: number) => (await service.find(id)) ?? Promise.reject(notFound('Bench'));

  router.get('/', requireRole('viewer'), async (_req, res) => {
    const rows = await service.list();
    res.json({ benches: rows.map((row) => withStatus(row, manager())) });
  });

  // Before /:id so that "ports" is not read as an id.
  router.get('/ports', requireRole('admin'), async (_req, res) => {
    res.json(await listSerialPorts());
  });

  router.get('/:id', requireRole('viewer'), async (req, res) => {
    res.json({ bench: withStatus(await findOr404(parseIdParam(req.params.id)), manager()) });
  });

  router.post('/', requireRole('admin'), async (req, res) => {
    const input = parseBody(CreateBenchRequestSchema, req.body);
    const row = await service.create(input);
    res.status(201).json({ bench: withStatus(row, manager()) });
  });

  router.patch('/:id', requireRole('admin'), async (req, res) => {
    const change = parseBody(UpdateBenchRequestSchema, req.body);
    const row = await service.update(await findOr404(parseIdParam(req.params.id)), change);
    res.json({ bench: withStatus(row, manager()) });
  });

  router.delete('/:id', requireRole('admin'), async (req, res) => {
    const row = await findOr404(parseIdParam(req.params.id));
    await assertNoLiveRun(ctx, row.id);
    const gatewayId = row.gatewayId ?? null;
    await service.remove(row);
    // A gateway's bench: its ACL grant and its place in the gateway's configuration go with it.
    if (gatewayId !== null) await ctx.services.gateways?.benchDeleted(gatewayId);
    res.status(204).end();
  });

  router.post('/:id/restart', requireRole('admin'), async (req, res) => {
    const row = await findOr404(parseIdParam(req.params.id));
    const running = manager();
    if (!running) throw new HttpError(503, 'The bench manager is not running on this server');
    if (!(await running.restart(row.id))) throw new HttpError(409, 'Bench is not running (disabled or not loaded)');
    res.json({ bench: withStatus(row, running) });
  });

  return router;
}
