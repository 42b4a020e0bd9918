import type { Transporter } from 'nodemailer';
import { BadAddressError, checkedAddress } from '../alarms/mail-message.js';
import { openSecret } from './sealed-secret.js';
import { SECRET_PLACEHOLDER, type ClaimedMail, type MailQueue } from './mail-queue.js';
import type { Logger } from '../log/logger.js';
import { LeaseWorker } from '../queue/lease-worker.js';

/** How often the worker looks for due rows when nothing kicked it. */
export const MAIL_POLL_MS = 1000;
/** How long a claim holds a row: longer than one SMTP send may take (it times out at 10 s a step). */
export const MAIL_LEASE_MS = 60_000;
/** Rows claimed per turn. */
const CLAIM_BATCH = 20;

/** What the worker needs. */
export interface MailWorkerDeps {
  queue: MailQueue;
  transport: Pick<Transporter, 'sendMail'>;
  /** The From address (checked when sending). */
  from: string;
  /** Key that opens the sealed secrets. */
  secretKey: Buffer;
  nowMs?: () => number;
  log: Logger;
}

/**
 * Sends queued outbound mail through SMTP as a lease worker (server/queue/lease-worker.ts),
 * off every request: a route only queues and kicks. A failure is recorded on the row and
 * retried with back-off; turns never overlap.
 */
export class MailWorker extends LeaseWorker<ClaimedMail> {
  constructor(deps: MailWorkerDeps) {
    const { queue } = deps;
    super({
      name: 'outbound mail',
      claim: (now, leaseMs, limit) => queue.claimDue(now, leaseMs, limit),
      handle: (row) => sendMail(deps, row),
      markSent: (row, now) => queue.markSent(row, now),
      markFailed: (row, error, now, permanent) => queue.markFailed(row, error, now, permanent),
      isPermanent: (err) => err instanceof BadAddressError,
      describe: (row) => `outbound mail ${row.id}`,
      pollMs: MAIL_POLL_MS, leaseMs: MAIL_LEASE_MS, claimBatch: CLAIM_BATCH,
      nowMs: deps.nowMs, log: deps.log,
    });
  }
}

/** Sends one row, its secret filled in from the sealed copy. */
async function sendMail(deps: MailWorkerDeps, row: ClaimedMail): Promise<void> {
  const secret = row.sealedSecret === null ? '' : openSecret(deps.secretKey, row.sealedSecret);
  const fill = (text: string) => text.split(SECRET_PLACEHOLDER).join(secret);
  await deps.transport.sendMail({
    from: checkedAddress(deps.from),
    to: checkedAddress(row.toAddress),
    ...(row.replyTo ? { replyTo: checkedAddress(row.replyTo) } : {}),
    subject: row.subject,
    text: fill(row.textBody),
    html: fill(row.htmlBody),
    messageId: row.messageId,
    // Nothing in a message may make the server read a file or fetch a URL.
    disableFileAccess: true,
    disableUrlAccess: true,
  });
}
