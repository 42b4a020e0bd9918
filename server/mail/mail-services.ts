import type { AppContext } from '../app-context.js';
import { UnavailableError } from '../domain/domain-errors.js';
import type { MailQueue, NewMail } from './mail-queue.js';

/** Outbound mail as routes use it: queue a message, seal its secret, build links. */
export interface OutboundMail {
  queue: MailQueue;
  /** Queues a message and has the worker send it soon; returns its row id, or null when the requester is over `limit`. */
  send(mail: NewMail, limit?: { count: number; since: Date }): Promise<number | null>;
  /** Seals a secret (a share token) for the queue row. */
  seal(secret: string): string;
  /** Base of links in mail, e.g. https://lab.example (no trailing slash). */
  publicUrl(): string;
  /** The From address. */
  from: string;
}

declare module '../app-context.js' {
  interface AppServices {
    /** Outbound mail (share links to clients) through the durable queue; set by the alarms root (server/compose/alarms-root.ts) when SMTP is set up. */
    outboundMail: OutboundMail;
  }
}

/** The outbound mail service, or 503 when this server has no SMTP set up. */
export function outboundMailOf(ctx: AppContext): OutboundMail {
  const mail = ctx.services.outboundMail;
  if (!mail) throw new UnavailableError('E-mail is not set up on this server (KNEEPOINT_SMTP_URL)');
  return mail;
}
