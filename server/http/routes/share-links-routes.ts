import { Router } from 'express';
import { CreateShareLinkRequestSchema, EmailShareLinkRequestSchema, ShareTargetKindSchema, type ShareTargetKind } from '../../../shared/schemas/share.js';
import type { AppContext } from '../../app-context.js';
import { requireRole } from '../../auth/guards.js';
import { HttpError, notFound } from '../http-error.js';
import { parseBody, parseIdParam } from '../validate.js';
import { checkedAddress } from '../../alarms/mail-message.js';
import { outboundMailOf } from '../../mail/mail-services.js';
import { RunsRepo } from '../../runs/runs-repo.js';
import { getLabSettings } from '../../settings/settings-service.js';
import { buildShareMail } from '../../share/share-mail.js';
import { ShareRepo } from '../../share/share-repo.js';
import { isShareToken, newShareToken, shareTokenHash } from '../../share/share-token.js';

const DAY_MS = 86_400_000;
const HOUR_MS = 3_600_000;
/** Share link e-mails one person may send in an hour (counted in the durable queue, so restarts do not reset it). */
export const SHARE_MAILS_PER_HOUR = 20;

/** A time as the lab reads it: its own time zone, named. */
function labTime(iso: string, timeZone: string): string {
  return `${new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'medium', timeStyle: 'short' }).format(new Date(iso))} (${timeZone})`;
}

/** The sender's address as Reply-To, when it is one a header may carry. */
function replyToOf(email: string): string | null {
  try {
    return checkedAddress(email);
  } catch {
    return null;
  }
}

/** The client route a token opens (never logged, never stored). */
export const sharedPagePath = (token: string) => `/s/${token}`;

/** /api/share-links: technicians and admins make, list and revoke links to a run's or a pack's report. */
export function createShareLinksRouter(ctx: AppContext): Router {
  const router = Router();
  const repo = new ShareRepo(ctx.sequelize);
  const runs = new RunsRepo(ctx.sequelize);
  const targetExists = async (kind: ShareTargetKind, id: number) =>
    kind === 'run' ? (await runs.get(id)) !== null : (await ctx.models.Battery.findByPk(id)) !== null;
  const packName = async (id: number) => {
    const pack = await ctx.models.Battery.findByPk(id);
    return pack ? `pack ${pack.brand} ${pack.label}` : `pack ${id}`;
  };
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

  // E-mails a link to a client through the durable outbound queue. The token must come with
  // the request: the server keeps only its hash, so only the maker (who saw it once) can send it.
  router.post('/:id/email', requireRole('technician'), async (req, res) => {
    const body = parseBody(EmailShareLinkRequestSchema, req.body);
    const link = await linkOr404(req.params.id);
    const active = isShareToken(body.token) ? await repo.active(shareTokenHash(body.token)) : null;
    if (!active || active.id !== link.id)
      throw new HttpError(400, 'This link cannot be e-mailed: it is revoked or expired, or the token is not this link\'s', { token: ['not the token of an active link'] });
    const mail = outboundMailOf(ctx);
    const lab = await getLabSettings(ctx.models);
    const what = link.kind === 'run' ? `run ${(await runs.get(link.targetId))?.name ?? link.targetId}` : await packName(link.targetId);
    const content = buildShareMail({ labName: lab.labName, senderName: req.user!.name, what, message: body.message, publicUrl: mail.publicUrl(), expires: labTime(link.expiresAt, lab.timeZone) });
    const mailId = await mail.send({
      purpose: 'share-link', refId: link.id, requestedById: req.user!.id, to: body.to, replyTo: replyToOf(req.user!.email),
      ...content, sealedSecret: mail.seal(body.token),
    }, { count: SHARE_MAILS_PER_HOUR, since: new Date(Date.now() - HOUR_MS) });
    if (mailId === null) throw new HttpError(429, `At most ${SHARE_MAILS_PER_HOUR} share e-mails an hour per person: try again later`);
    res.status(202).json({ queued: true, mailId });
  });

  router.get('/:id/mails', requireRole('technician'), async (req, res) => {
    const link = await linkOr404(req.params.id);
    res.json({ mails: await outboundMailOf(ctx).queue.list('share-link', link.id) });
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
