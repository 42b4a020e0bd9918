import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, contentHash } from './canonical-json.js';

describe('canonical JSON and its hash', () => {
  it('sorts keys at every depth, keeps array order and drops undefined', () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: 2 }], c: undefined } })).toBe('{"a":{"d":[3,{"y":2,"z":1}]},"b":1}');
  });

  it('gives the same hash for the same content in any key order, another for other content', () => {
    expect(contentHash({ a: 1, b: 'x' })).toBe(contentHash({ b: 'x', a: 1 }));
    expect(contentHash({ a: 1, b: 'x' })).not.toBe(contentHash({ a: 1, b: 'y' }));
  });

  it('is the SHA-256 of the text (FIPS 180-4 test vector "abc", as a JSON string "\\"abc\\"" differs)', () => {
    // FIPS 180-4 / NIST example: SHA-256("abc") = ba7816bf...f20015ad.
    expect(createHash('sha256').update('abc').digest('hex')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(contentHash('abc')).toBe(createHash('sha256').update('"abc"').digest('hex'));
  });
});
