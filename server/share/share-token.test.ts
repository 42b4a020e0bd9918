import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { addressHash, isShareToken, newShareToken, SHARE_TOKEN_BYTES, shareTokenHash } from './share-token.js';

describe('share tokens', () => {
  it('carry at least 128 random bits, base64url without padding, and differ each time', () => {
    expect(SHARE_TOKEN_BYTES * 8).toBeGreaterThanOrEqual(128);
    const tokens = new Set(Array.from({ length: 1000 }, newShareToken));
    expect(tokens.size).toBe(1000);
    for (const token of tokens) {
      expect(isShareToken(token)).toBe(true);
      expect(Buffer.from(token, 'base64url')).toHaveLength(SHARE_TOKEN_BYTES);
    }
  });

  it('are stored as their SHA-256 (FIPS 180-4 test vector for "abc")', () => {
    // FIPS 180-4 / NIST example value for SHA-256("abc").
    expect(shareTokenHash('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const token = newShareToken();
    expect(shareTokenHash(token)).toBe(createHash('sha256').update(token).digest('hex'));
    expect(shareTokenHash(token)).not.toContain(token);
  });

  it('refuse anything not shaped like a token', () => {
    for (const bad of ['', 'abc', `${newShareToken()}x`, `${newShareToken().slice(1)}=`, '../'.repeat(15) + 'ab', `${newShareToken().slice(1)}/`]) {
      expect(isShareToken(bad)).toBe(false);
    }
  });

  it('hash an address with a key (RFC 4231 test case 2 for HMAC-SHA256)', () => {
    // RFC 4231, test case 2: key "Jefe", data "what do ya want for nothing?".
    expect(addressHash('what do ya want for nothing?', 'Jefe')).toBe('5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843');
  });
});
