import { describe, expect, it } from 'vitest';
import { scryptSync } from 'node:crypto';
import { hashPassword, verifyPassword } from './password.js';

describe('password hashing (scrypt from node:crypto)', () => {
  it('verifies the right password and rejects a wrong one', async () => {
    const hash = await hashPassword('correct horse battery');
    expect(await verifyPassword('correct horse battery', hash)).toBe(true);
    expect(await verifyPassword('correct horse batterY', hash)).toBe(false);
  });

  it('salts each hash, so the same password never gives the same string', async () => {
    expect(await hashPassword('same-password-1')).not.toBe(await hashPassword('same-password-1'));
  });

  it('stores the scrypt parameters with the hash, matching a direct scryptSync computation', async () => {
    const hash = await hashPassword('bench-password');
    const [scheme, n, r, p, salt, key] = hash.split('$');
    expect(scheme).toBe('scrypt');
    // Reference: Node's own scryptSync over the same inputs (RFC 7914 scrypt).
    const expected = scryptSync('bench-password', Buffer.from(salt, 'base64'), 64, { N: Number(n), r: Number(r), p: Number(p), maxmem: 64 * 1024 * 1024 });
    expect(Buffer.from(key, 'base64').equals(expected)).toBe(true);
  });

  it('rejects a malformed stored hash instead of throwing', async () => {
    expect(await verifyPassword('anything', 'not-a-hash')).toBe(false);
    expect(await verifyPassword('anything', 'bcrypt$1$2$3$4$5')).toBe(false);
  });
});
