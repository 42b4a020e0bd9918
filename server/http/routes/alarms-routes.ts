import { Router } from 'express';
import { z } from 'zod';
import {
  AlarmSettingsSchema, AlarmSubscriptionsInputSchema, OnCallInputSchema, ShelveInputSchema,
} from '../../../shared/schemas/alarm.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { AlarmRepo } from '../../alarms/alarm-repo.js';
import { alarmsOf } from '../../alarms/alarms-services.js';
import { DeliveryQueue } from '../../alarms/delivery-queue.js';
import { MS_PER_MINUTE } from '../../../shared/units/time.js';

/** Most alarms the in-app list returns. */
const INBOX_LIMIT = 100;
const ListQuerySchema = z.object({
  runId: z.string().regex(/^[1-9]\d*$/, 'a run id').transform(Number).optional(),
  open: z.enum(['1', 'true']).optional(),
});
const DeliveriesQuerySchema = z.object({ alarmId: z.string().regex(/^[1-9]\d*$/, 'an alarm id').transform(Number).optional() });

/**
 * /api/alarms: everyone signed in reads alarms and manages their OWN subscriptions (the user
 * comes from the session, never from the request); technicians acknowledge; admins set
 * on-call lists, shelve, change the alarm settings and read the outbox and delivery log.
 */
export function createAlarmsRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new AlarmRepo(ctx.sequelize);
  // Retry figures do not matter here: the routes only read the queue.
  const queue = new DeliveryQueue(ctx.sequelize, { firstMs: 1, maxMs: 1, maxAttempts: 1 });

  router.get('/', requireRole('viewer'), async (req, res) => {
    const q = parseBody(ListQuerySchema, req.query);
    res.json({ alarms: await repo.list({ runId: q.runId, open: q.open !== undefined }) });
  });

  router.get('/inbox', requireRole('viewer'), async (req, res) => {
    const ids = await queue.inAppAlarmIds(req.user!.id, INBOX_LIMIT);
    const alarms = (await Promise.all(ids.map((id) => repo.get(id)))).filter((a) => a !== null);
    res.json({ alarms });
  });

  router.get('/channels', requireRole('viewer'), (_req, res) => {
    const channels = ctx.services.alarmChannels;
    res.json({ channels: (['in-app', 'email', 'push'] as const).filter((c) => channels?.has(c) ?? false) });
  });

  router.get('/subscriptions', requireRole('viewer'), async (req, res) => {
    res.json({ subscriptions: await repo.subscriptionsOf(req.user!.id) });
  });

  router.put('/subscriptions', requireRole('viewer'), async (req, res) => {
    const body = parseBody(AlarmSubscriptionsInputSchema, req.body);
    const benchIds = [...new Set(body.subscriptions.flatMap((s) => (s.benchId === null ? [] : [s.benchId])))];
    const missing = await repo.missingBenches(benchIds);
    if (missing.length > 0) throw new HttpError(400, `No such bench: ${missing.join(', ')}`, { subscriptions: [`no bench ${missing.join(', ')}`] });
    res.json({ subscriptions: await repo.replaceSubscriptions(req.user!.id, body.subscriptions) });
  });

  router.get('/on-call/:benchId', requireRole('viewer'), async (req, res) => {
    res.json({ onCall: await repo.onCall(parseIdParam(req.params.benchId, 'benchId')) });
  });

  router.put('/on-call/:benchId', requireRole('admin'), async (req, res) => {
    const benchId = parseIdParam(req.params.benchId, 'benchId');
    const body = parseBody(OnCallInputSchema, req.body);
    if ((await repo.missingBenches([benchId])).length > 0) throw notFound(`Bench ${benchId}`);
    const missing = await repo.missingUsers(body.userIds);
    if (missing.length > 0) throw new HttpError(400, `No such user: ${missing.join(', ')}`, { userIds: [`no user ${missing.join(', ')}`] });
    await repo.setOnCall(benchId, body.userIds);
    res.json({ onCall: await repo.onCall(benchId) });
  });

  router.get('/shelves', requireRole('viewer'), async (_req, res) => {
    res.json({ shelves: await repo.shelves() });
  });

  router.post('/shelves', requireRole('admin'), async (req, res) => {
    const body = parseBody(ShelveInputSchema, req.body);
    if ((await repo.missingBenches([body.benchId])).length > 0) throw new HttpError(400, `No such bench: ${body.benchId}`, { benchId: ['no such bench'] });
    const at = new Date();
    const id = await repo.shelve({ ...body, userId: req.user!.id, at, until: new Date(at.getTime() + body.minutes * MS_PER_MINUTE) });
    ctx.log.info(`alarm kind ${body.kind} shelved on bench ${body.benchId} for ${body.minutes} min by user ${req.user!.id}: ${body.reason}`);
    res.status(201).json({ shelf: (await repo.shelves()).find((s) => s.id === id) });
  });

  router.post('/shelves/:id/end', requireRole('admin'), async (req, res) => {
    const id = parseIdParam(req.params.id);
    if (!(await repo.unshelve(id, req.user!.id, new Date()))) throw new HttpError(409, `Shelving ${id} does not exist or has already ended`);
    res.json({ shelf: (await repo.shelves()).find((s) => s.id === id) });
  });

  router.get('/settings', requireRole('viewer'), async (_req, res) => {
    res.json({ settings: await repo.settings() });
  });

  router.put('/settings', requireRole('admin'), async (req, res) => {
    res.json({ settings: await repo.saveSettings(parseBody(AlarmSettingsSchema, req.body)) });
  });

  router.get('/outbox', requireRole('admin'), async (_req, res) => {
    res.json({ messages: await repo.outbox(), fakeSmtp: ctx.services.fakeSmtp ? { url: ctx.services.fakeSmtp.url } : null });
  });

  router.get('/deliveries', requireRole('admin'), async (req, res) => {
    res.json({ deliveries: await queue.list(parseBody(DeliveriesQuerySchema, req.query).alarmId) });
  });

  router.get('/:id', requireRole('viewer'), async (req, res) => {
    const alarm = await repo.get(parseIdParam(req.params.id));
    if (!alarm) throw notFound(`Alarm ${req.params.id}`);
    res.json({ alarm });
  });

  router.post('/:id/acknowledge', requireRole('technician'), async (req, res) => {
    res.json({ alarm: await alarmsOf(ctx).acknowledge(parseIdParam(req.params.id), req.user!) });
  });

  return router;
}
