import { Router, type RequestHandler } from 'express';
import { roleAtLeast } from '../../../shared/schemas/user.js';
import { PushAcknowledgeSchema, PushSubscriptionInputSchema, PushUnsubscribeSchema } from '../../../shared/schemas/push.js';
import type { AppContext } from '../../app-context.js';
import { alarmsOf } from '../../alarms/alarms-services.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError } from '../http-error.js';
import { parseBody } from '../validate.js';
import { verifyAckToken } from '../../push/ack-token.js';
import { PushSubscriptionRepo } from '../../push/push-subscription-repo.js';
import { pushOf } from '../../push/push-services.js';

/**
 * /api/push (session and CSRF like every route): the server's VAPID public key, and the
 * signed-in user's OWN browser subscriptions (add, remove).
 */
export function createPushRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new PushSubscriptionRepo(ctx.sequelize);

  router.get('/key', requireRole('viewer'), (_req, res) => {
    res.json({ publicKey: pushOf(ctx).vapid.publicKey });
  });

  router.post('/subscriptions', requireRole('viewer'), async (req, res) => {
    pushOf(ctx);
    const sub = parseBody(PushSubscriptionInputSchema, req.body);
    await repo.save(req.user!.id, sub, req.get('user-agent'), new Date());
    res.status(201).json({ subscribed: true });
  });

  router.delete('/subscriptions', requireRole('viewer'), async (req, res) => {
    const body = parseBody(PushUnsubscribeSchema, req.body);
    res.json({ removed: await repo.removeOwn(req.user!.id, body.endpoint) });
  });

  return router;
}

/**
 * POST /api/push/acknowledge {alarmId, token}: the notification's Acknowledge action. The
 * service worker has no CSRF token to hand, so this route sits before the session and CSRF
 * check and is authorised by the token alone: an HMAC bound to that alarm and user with an
 * expiry. The user must still be enabled and a technician or above; it is recorded as them.
 */
export function pushAcknowledgeRoute(ctx: AppContext): RequestHandler {
  return (req, res, next) => {
    void (async () => {
      const body = parseBody(PushAcknowledgeSchema, req.body);
      const userId = verifyAckToken(pushOf(ctx).ackSecret, body.alarmId, body.token, Date.now());
      if (userId === null) throw new HttpError(403, 'This acknowledge link is not valid or has expired: open the alarm in the app');
      const user = await ctx.models.User.findByPk(userId);
      if (!user || user.disabled) throw new HttpError(403, 'This account cannot acknowledge alarms');
      if (!roleAtLeast(user.role, 'technician')) throw new HttpError(403, 'This needs the technician role or higher');
      res.json({ alarm: await alarmsOf(ctx).acknowledge(body.alarmId, { id: user.id, name: user.name }) });
    })().catch(next);
  };
}
