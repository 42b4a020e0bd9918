import { escapeHtml, headerSafe } from '../alarms/mail-message.js';
import { SECRET_PLACEHOLDER } from '../mail/mail-queue.js';

/** Longest subject line written (folded by nodemailer past 78 characters, RFC 5322). */
const MAX_SUBJECT_CHARS = 200;

/** What the share link e-mail says. */
export interface ShareMailInput {
  labName: string;
  senderName: string;
  /** What is shared, e.g. "run Capacity 7" or "pack Voltara Cell Stack 7". */
  what: string;
  /** The technician's note, if any (body only). */
  message: string | undefined;
  /** Base of links (no trailing slash). */
  publicUrl: string;
  /** When the link stops working, as the lab writes times. */
  expires: string;
}

/**
 * The e-mail that hands a client a share link, in plain text and HTML. The link's token is not
 * in it: SECRET_PLACEHOLDER stands where it goes, filled from the sealed secret at send time,
 * so the database never holds the token in clear. Names reach the subject only through
 * headerSafe; the note only the body (escaped in the HTML).
 */
export function buildShareMail(input: ShareMailInput): { subject: string; text: string; html: string } {
  const link = `${input.publicUrl}/s/${SECRET_PLACEHOLDER}`;
  const note = input.message?.replace(/\r\n?/g, '\n').trim() ?? '';
  const intro = `${input.senderName} of ${input.labName} shared a report with you: ${input.what}.`;
  const subject = headerSafe(`[${input.labName}] ${input.senderName} shared a report with you: ${input.what}`, MAX_SUBJECT_CHARS);
  const text = [
    intro,
    ...(note ? ['', ...note.split('\n').map((line) => `> ${line}`)] : []),
    '',
    `Open the report (read-only, no account needed): ${link}`,
    `The link works until ${input.expires}.`,
    '',
    'If you did not expect this message, you can ignore it.',
  ].join('\n');
  const html = [
    `<p>${escapeHtml(intro)}</p>`,
    ...(note ? [`<blockquote>${note.split('\n').map(escapeHtml).join('<br>')}</blockquote>`] : []),
    `<p><a href="${escapeHtml(link)}">Open the report</a> (read-only, no account needed). The link works until ${escapeHtml(input.expires)}.</p>`,
    '<p>If you did not expect this message, you can ignore it.</p>',
  ].join('\n');
  return { subject, text, html };
}
