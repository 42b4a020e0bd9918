import { createCipheriv, createDecipheriv, createHash, randomBytes } from 'node:crypto';

/** AES-256-GCM: a 12-byte IV and a 16-byte tag (NIST SP 800-38D's recommended sizes). */
const IV_BYTES = 12;
const TAG_BYTES = 16;

/** The sealing key, derived from the server's secret so that nothing else needs storing. */
export function sealingKey(serverSecret: string): Buffer {
  return createHash('sha256').update(`kneepoint mail secret\0${serverSecret}`).digest();
}

/** Seals a secret for storage (base64url of IV, tag and ciphertext). */
export function sealSecret(key: Buffer, secret: string): string {
  const iv = randomBytes(IV_BYTES);
  const cipher = createCipheriv('aes-256-gcm', key, iv);
  const body = Buffer.concat([cipher.update(secret, 'utf8'), cipher.final()]);
  return Buffer.concat([iv, cipher.getAuthTag(), body]).toString('base64url');
}

/** Opens a sealed secret; throws when it was not sealed with this key or was changed. */
export function openSecret(key: Buffer, sealed: string): string {
  const raw = Buffer.from(sealed, 'base64url');
  const decipher = createDecipheriv('aes-256-gcm', key, raw.subarray(0, IV_BYTES));
  decipher.setAuthTag(raw.subarray(IV_BYTES, IV_BYTES + TAG_BYTES));
  return Buffer.concat([decipher.update(raw.subarray(IV_BYTES + TAG_BYTES)), decipher.final()]).toString('utf8');
}
