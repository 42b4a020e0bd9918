import { createHash, createHmac, randomBytes } from 'node:crypto';

/** Random bytes in a share token: 256 bits, twice the 128 a link must at least carry. */
export const SHARE_TOKEN_BYTES = 32;
/** A token as it travels: base64url of SHARE_TOKEN_BYTES bytes, no padding (43 characters). */
export const SHARE_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

/** A fresh unguessable token (crypto.randomBytes, base64url). */
export function newShareToken(): string {
  return randomBytes(SHARE_TOKEN_BYTES).toString('base64url');
}

/** What the database keeps instead of the token: its SHA-256, hex. */
export function shareTokenHash(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** True when `text` has the shape of a token (anything else is answered 404 without a lookup). */
export const isShareToken = (text: string): boolean => SHARE_TOKEN_PATTERN.test(text);

/** The opener's address as a keyed hash (HMAC-SHA256 with the server's secret): comparable, not readable. */
export function addressHash(address: string, secret: string): string {
  return createHmac('sha256', secret).update(address, 'utf8').digest('hex');
}
