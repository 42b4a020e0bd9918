import { inspect } from 'node:util';
import type { Logger } from '../app-context.js';

/** A share link's path segment (API or client page) followed by whatever token it carries. */
const SHARED_PATH = /\/(shared|s)\/[^/?#\s"']+/g;
/** A bare share token (43 base64url characters standing alone), wherever it turns up. */
const BARE_TOKEN = /(?<![A-Za-z0-9_-])[A-Za-z0-9_-]{43}(?![A-Za-z0-9_-])/g;

/** `text` with every share token replaced by `[redacted]`. */
export function redactShareTokens(text: string): string {
  return text.replace(SHARED_PATH, '/$1/[redacted]').replace(BARE_TOKEN, '[redacted]');
}

/** An error (or anything logged beside a message) with share tokens taken out of its text. */
function redactLogged(value: unknown): unknown {
  if (value === undefined) return undefined;
  if (value instanceof Error) {
    const copy = new Error(redactShareTokens(value.message));
    copy.name = value.name;
    copy.stack = value.stack === undefined ? undefined : redactShareTokens(value.stack);
    return copy;
  }
  return redactShareTokens(typeof value === 'string' ? value : inspect(value, { depth: 4 }));
}

/** Wraps a logger so that no share token reaches the server's log, whatever is logged. */
export function redactingLogger(log: Logger): Logger {
  return {
    info: (message, error) => log.info(redactShareTokens(message), redactLogged(error)),
    warn: (message, error) => log.warn(redactShareTokens(message), redactLogged(error)),
    error: (message, error) => log.error(redactShareTokens(message), redactLogged(error)),
  };
}
