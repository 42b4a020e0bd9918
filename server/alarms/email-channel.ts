import nodemailer, { type Transporter } from 'nodemailer';
import type { AlarmChannel } from './alarm-channel.js';
import { buildAlarmMail } from './mail-message.js';

/** How long an SMTP connection may take before the attempt counts as failed (the queue retries). */
const SMTP_TIMEOUT_MS = 10_000;

/** Where alarm mail goes: an SMTP URL (smtp:// or smtps://) and whether TLS is required. */
export interface SmtpTarget {
  url: string;
  requireTls: boolean;
  from: string;
}

/** A nodemailer transport for the target (smtps:// = TLS from the start; smtp:// upgrades with STARTTLS when offered). */
export function createSmtpTransport(target: SmtpTarget): Transporter {
  const url = new URL(target.url);
  return nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port) || (url.protocol === 'smtps:' ? 465 : 587),
    secure: url.protocol === 'smtps:',
    requireTLS: target.requireTls,
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    connectionTimeout: SMTP_TIMEOUT_MS,
    greetingTimeout: SMTP_TIMEOUT_MS,
    socketTimeout: SMTP_TIMEOUT_MS,
  });
}

/** The e-mail channel: builds the message and hands it to SMTP (a refusal throws, so the queue retries). */
export function emailChannel(transport: Pick<Transporter, 'sendMail'>, from: string): AlarmChannel {
  return {
    name: 'email',
    deliver: async (delivery) => {
      const mail = buildAlarmMail(delivery, from);
      // disableFileAccess/disableUrlAccess: nothing in a message may make the server read a file or fetch a URL.
      await transport.sendMail({ ...mail, disableFileAccess: true, disableUrlAccess: true });
    },
  };
}
