import type { Transporter } from 'nodemailer';
import { BadAddressError, checkedAddress } from '../alarms/mail-message.js';
import { openSecret } from './sealed-secret.js';
import { SECRET_PLACEHOLDER, type ClaimedMail, type MailQueue } from './mail-queue.js';
import type { Logger } from '../log/logger.js';

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
 * Sends queued outbound mail through SMTP on its own timer, off every request: a route only
 * queues and kicks. A failure is recorded on the row and retried with back-off; turns never overlap.
 */
export class MailWorker {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private again = false;
  private stopped = false;

  constructor(private readonly deps: MailWorkerDeps) {}

  /** Starts the poll timer. */
  start(): void {
    this.stopped = false;
    this.timer = setInterval(() => this.kick(), MAIL_POLL_MS);
    this.timer.unref();
    this.kick();
  }

  /** Runs a turn soon (after a row was added). */
  kick(): void {
    if (this.stopped) return;
    if (this.running) {
      this.again = true;
      return;
    }
    this.running = this.turn()
      .catch((err: unknown) => this.deps.log.error('outbound mail pass failed', err))
      .finally(() => {
        this.running = null;
        if (this.again) {
          this.again = false;
          this.kick();
        }
      });
  }

  /** Stops the timer and waits for the sends under way. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }

  private now(): Date {
    return new Date((this.deps.nowMs ?? Date.now)());
  }

  private async turn(): Promise<void> {
    for (;;) {
      const rows = await this.deps.queue.claimDue(this.now(), MAIL_LEASE_MS, CLAIM_BATCH);
      if (rows.length === 0) return;
      await Promise.all(rows.map((row) => this.sendOne(row)));
      if (this.stopped) return;
    }
  }

  private async sendOne(row: ClaimedMail): Promise<void> {
    const { queue } = this.deps;
    try {
      const secret = row.sealedSecret === null ? '' : openSecret(this.deps.secretKey, row.sealedSecret);
      const fill = (text: string) => text.split(SECRET_PLACEHOLDER).join(secret);
      await this.deps.transport.sendMail({
        from: checkedAddress(this.deps.from),
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
      await queue.markSent(row, this.now());
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      const status = await queue.markFailed(row, message, this.now(), err instanceof BadAddressError);
      this.deps.log.warn(`outbound mail ${row.id} failed, ${status === 'failed' ? 'given up' : 'will retry'}`, err);
    }
  }
}
