/** A received message reduced to what the outbox shows. */
export interface DecodedMail {
  subject: string;
  text: string;
  html: string | null;
  headers: Map<string, string>;
}

/** Splits a raw message at the first blank line; unfolds headers (lower-case names; first wins). */
function splitHeaders(raw: string): { headers: Map<string, string>; body: string } {
  const cut = raw.search(/\r?\n\r?\n/);
  const head = cut < 0 ? raw : raw.slice(0, cut);
  const body = cut < 0 ? '' : raw.slice(cut).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).trim());
  }
  return { headers, body };
}

/** Decodes quoted-printable text (UTF-8): soft line breaks removed, =XX turned back into bytes. */
function decodeQuotedPrintable(text: string): string {
  const s = text.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < s.length; i++) {
    const hex = s[i] === '=' ? s.slice(i + 1, i + 3) : '';
    if (/^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else bytes.push(...Buffer.from(s[i]!, 'utf8'));
  }
  return Buffer.from(bytes).toString('utf8');
}

/** Decodes a part's body by its Content-Transfer-Encoding. */
function decodeBody(body: string, encoding: string | undefined): string {
  const e = (encoding ?? '7bit').toLowerCase();
  if (e === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  if (e === 'quoted-printable') return decodeQuotedPrintable(body);
  return body;
}

/** Decodes RFC 2047 encoded words (=?UTF-8?Q?…?= and =?UTF-8?B?…?=) in a header value. */
export function decodeHeaderWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_, _charset: string, enc: string, data: string) =>
      enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' ')));
}

/** Collects the text/plain and text/html parts of a (possibly multipart) message. */
function collect(raw: string, out: { text: string | null; html: string | null }): Map<string, string> {
  const { headers, body } = splitHeaders(raw);
  const type = headers.get('content-type') ?? 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) if (!part.startsWith('--')) collect(part.replace(/^\r?\n/, ''), out);
  } else if (/^text\/html/i.test(type)) out.html ??= decodeBody(body, headers.get('content-transfer-encoding'));
  else if (/^text\/plain/i.test(type)) out.text ??= decodeBody(body, headers.get('content-transfer-encoding'));
  return headers;
}

/** Decodes the parts of a message the outbox shows: subject, plain text and HTML. */
export function decodeMail(raw: string): DecodedMail {
  const out = { text: null as string | null, html: null as string | null };
  const headers = collect(raw, out);
  return { subject: decodeHeaderWords(headers.get('subject') ?? ''), text: (out.text ?? '').replace(/\r\n/g, '\n').trimEnd(), html: out.html, headers };
}
