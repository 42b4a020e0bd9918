import { describe, expect, it } from 'vitest';
import type { Logger } from '../app-context.js';
import { newShareToken } from '../share/share-token.js';
import { redactingLogger, redactShareTokens } from './redact-tokens.js';

describe('share tokens never reach the log', () => {
  const token = newShareToken();

  it('takes the token out of API and page paths, query strings and bare mentions', () => {
    for (const text of [`GET /api/shared/${token}`, `GET /api/shared/${token}/samples?from=0`, `/s/${token}`, `token ${token} refused`, `"${token}"`]) {
      const redacted = redactShareTokens(text);
      expect(redacted).not.toContain(token);
      expect(redacted).toContain('[redacted]');
    }
    expect(redactShareTokens(`GET /api/shared/${token}/photos/4/thumb`)).toBe('GET /api/shared/[redacted]/photos/4/thumb');
  });

  it('leaves other text alone, SHA-256 hex digests included', () => {
    const digest = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';
    for (const text of ['GET /api/runs/12/samples', `hash ${digest}`, 'Bench 3 started']) expect(redactShareTokens(text)).toBe(text);
  });

  it('redacts messages, errors (message and stack) and other values handed to the logger', () => {
    const lines: string[] = [];
    const sink: Logger = {
      info: (m) => lines.push(m),
      warn: (m) => lines.push(m),
      error: (m, e) => lines.push(m, e instanceof Error ? `${e.name}: ${e.message}\n${e.stack}` : String(e)),
    };
    const log = redactingLogger(sink);
    log.info(`opened /api/shared/${token}`);
    log.warn(`slow /s/${token}`);
    const error = new TypeError(`bad token ${token}`);
    log.error(`Unhandled error on GET /api/shared/${token}`, error);
    log.error('with an object', { url: `/api/shared/${token}` });
    const all = lines.join('\n');
    expect(all).not.toContain(token);
    expect(all).toContain('TypeError: bad token [redacted]');
    expect(lines).toHaveLength(6);
  });
});
