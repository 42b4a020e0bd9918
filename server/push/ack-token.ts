import { createHmac, timingSafeEqual } from 'node:crypto';

/** How long a push notification's Acknowledge action stays usable. */
export const ACK_TOKEN_LIFETIME_MS = 24 * 60 * 60 * 1000;

/** What an acknowledge token proves: this user may acknowledge this alarm until then. */
export interface AckTokenClaim {
  alarmId: number;
  userId: number;
  expiresAtMs: number;
}

function signature(secret: string, claim: AckTokenClaim): Buffer {
  return createHmac('sha256', secret).update(`ack.${claim.alarmId}.${claim.userId}.${claim.expiresAtMs}`).digest();
}

/**
 * A token bound to one alarm and one user, carried in the push payload, so the service worker
 * can acknowledge with no tab open (no CSRF token to hand): `userId.expiresAtMs.hmac`.
 */
export function makeAckToken(secret: string, claim: AckTokenClaim): string {
  return `${claim.userId}.${claim.expiresAtMs}.${signature(secret, claim).toString('base64url')}`;
}

/** The user the token names, when it is well formed, signed by us for that alarm and not expired; else null. */
export function verifyAckToken(secret: string, alarmId: number, token: string, nowMs: number): number | null {
  const m = /^([1-9]\d{0,9})\.(\d{1,15})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const claim = { alarmId, userId: Number(m[1]), expiresAtMs: Number(m[2]) };
  if (claim.expiresAtMs < nowMs) return null;
  const sent = Buffer.from(m[3]!, 'base64url');
  const expected = signature(secret, claim);
  return sent.length === expected.length && timingSafeEqual(sent, expected) ? claim.userId : null;
}
