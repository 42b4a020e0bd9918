import { Router } from 'express';
import { AssignBenchesRequestSchema, CreateGatewayRequestSchema } from '../../../shared/schemas/gateway.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { GatewayNameTakenError, UnknownBenchError } from '../../mqtt/gateway-service.js';

const notConfigured = () => new HttpError(409, 'MQTT is not configured: set KNEEPOINT_MQTT=local or KNEEPOINT_MQTT_URL (see docs/scale-out.md)');

/** /api/gateways: everyone signed in reads gateways and their state; admins register, revoke and assign. */
export function createGatewaysRouter(ctx: AppContext): Router {
  const router = Router();
  const service = () => ctx.services.gateways ?? Promise.reject(notConfigured());
  const mapErrors = (err: unknown): never => {
    if (err instanceof GatewayNameTakenError) throw new HttpError(409, err.message, { name: [err.message] });
    if (err instanceof UnknownBenchError) throw new HttpError(400, err.message, { benchIds: [err.message] });
    throw err;
  };

  router.get('/', requireRole('viewer'), async (_req, res) => {
    const gateways = ctx.services.gateways;
    res.json({ gateways: gateways ? await gateways.list() : [], mqtt: gateways !== undefined });
  });

  router.post('/', requireRole('admin'), async (req, res) => {
    const { name } = parseBody(CreateGatewayRequestSchema, req.body);
    const created = await (await service()).create(name).catch(mapErrors);
    res.status(201).json(created);
  });

  router.put('/:id/benches', requireRole('admin'), async (req, res) => {
    const { benchIds } = parseBody(AssignBenchesRequestSchema, req.body);
    const gateway = await (await service()).assign(parseIdParam(req.params.id), benchIds).catch(mapErrors);
    if (!gateway) throw notFound('Gateway');
    res.json({ gateway });
  });

  router.post('/:id/revoke', requireRole('admin'), async (req, res) => {
    const gateway = await (await service()).revoke(parseIdParam(req.params.id));
    if (!gateway) throw notFound('Gateway');
    res.json({ gateway });
  });

  return router;
}
