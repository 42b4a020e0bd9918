import { Router } from 'express';
import type { AppContext } from '../../app-context.js';
import { CreateUserRequestSchema, UpdateUserRequestSchema } from '../../../shared/schemas/user.js';
import { requireRole } from '../../auth/guards.js';
import { endUserSessions } from '../../auth/end-sessions.js';
import { parseBody, parseIdParam } from '../validate.js';
import { createUser, listUsers, updateUser } from '../../users/users-service.js';

/** /api/users: admin only (list, create, set role, rename, disable). */
export function createUsersRouter(ctx: AppContext): Router {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/', async (_req, res) => {
    res.json({ users: await listUsers(ctx.models) });
  });

  router.post('/', async (req, res) => {
    const user = await createUser(ctx.models, parseBody(CreateUserRequestSchema, req.body));
    res.status(201).json({ user });
  });

  router.patch('/:id', async (req, res) => {
    const change = parseBody(UpdateUserRequestSchema, req.body);
    const user = await updateUser(ctx.models, req.user!.id, parseIdParam(req.params.id), change);
    // A disabled account loses its sessions and live sockets now, and stays signed out if re-enabled.
    if (change.disabled) await endUserSessions(ctx, user.id);
    res.json({ user });
  });

  return router;
}
