import { createHash } from 'node:crypto';

/** JSON with object keys sorted at every depth, so equal content always gives equal text. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value && typeof value === 'object') {
    const source = value as Record<string, unknown>;
    return Object.fromEntries(Object.keys(source).sort().filter((k) => source[k] !== undefined).map((k) => [k, sortKeys(source[k])]));
  }
  return value;
}

/** SHA-256 (hex) of the canonical JSON of `value`. */
export function contentHash(value: unknown): string {
  return textHash(canonicalJson(value));
}

/** SHA-256 (hex) of stored text as it is (a frozen snapshot is checked over its stored bytes, never re-serialised). */
export function textHash(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}
