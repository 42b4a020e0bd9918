import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { HttpError } from './http-error.js';
import { domainErrorStatus } from './domain-error-status.js';
import { DomainError } from '../domain/domain-errors.js';
import { isConnectionFailure } from '../db/connection-errors.js';
import type { Logger } from '../log/logger.js';

/** The JSON shape of every error answer: `{ error: { message, fields? } }`. */
export interface ErrorBody {
  error: { message: string; fields?: Record<string, string[]> };
}

function zodFields(error: ZodError): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of error.issues) {
    // An unknown key is listed under its own name, so the answer says which key to remove.
    const paths = issue.code === 'unrecognized_keys' ? issue.keys.map((k) => [...issue.path, k]) : [issue.path];
    for (const path of paths) {
      const key = path.length > 0 ? path.join('.') : '(body)';
      (fields[key] ??= []).push(issue.code === 'unrecognized_keys' ? 'unknown field' : issue.message);
    }
  }
  return fields;
}

/** Errors thrown by body-parser carry a `type` and a `status`. */
function bodyParserError(error: unknown): { status: number; message: string } | undefined {
  const err = error as { type?: string; status?: number; limit?: number };
  switch (err?.type) {
    case 'entity.parse.failed':
      return { status: 400, message: 'Malformed JSON in request body' };
    case 'entity.too.large':
      return { status: 413, message: `Request body too large (limit ${err.limit ?? '?'} bytes)` };
    case 'encoding.unsupported':
    case 'charset.unsupported':
      return { status: 415, message: 'Unsupported body encoding' };
    case 'request.aborted':
      return { status: 400, message: 'Request aborted' };
    default:
      return undefined;
  }
}

/** How long a client should wait before asking again while the database is away. */
export const DATABASE_RETRY_AFTER_S = 5;
const DATABASE_AWAY_MESSAGE = 'The database is not available right now. Recording and live readings continue; try again in a few seconds.';

/** Sequelize errors that are the client's fault, mapped to their status. */
function databaseError(error: unknown): { status: number; message: string } | undefined {
  const name = (error as { name?: string })?.name;
  if (name === 'SequelizeUniqueConstraintError') return { status: 409, message: 'A record with the same unique value already exists' };
  if (name === 'SequelizeForeignKeyConstraintError') return { status: 409, message: 'The record is referenced by other records or refers to a missing one' };
  return undefined;
}

/**
 * The one error handler: zod → 400 with field names, body-parser → 400/413, HttpError → its
 * status, a domain error → the status of its kind (domain-error-status.ts), the database away
 * (refused, broken or timed-out connection) → 503, anything else → 500 with a generic message
 * (the details go to the server log only).
 */
export function createErrorHandler(log: Logger): ErrorRequestHandler {
  return (error, req, res, next) => {
    if (res.headersSent) return next(error);
    const send = (status: number, body: ErrorBody['error']) => res.status(status).json({ error: body } satisfies ErrorBody);
    if (error instanceof ZodError) return send(400, { message: 'Invalid request: check the listed fields', fields: zodFields(error) });
    if (error instanceof HttpError) return send(error.status, { message: error.message, ...(error.fields && { fields: error.fields }) });
    const domainStatus = domainErrorStatus(error);
    if (domainStatus !== undefined) {
      const { message, fields } = error as DomainError;
      return send(domainStatus, { message, ...(fields && { fields }) });
    }
    if (isConnectionFailure(error)) {
      res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
      const message = (error as Error).name === 'DatabaseUnavailableError' ? (error as Error).message : DATABASE_AWAY_MESSAGE;
      return send(503, { message });
    }
    const known = bodyParserError(error) ?? databaseError(error);
    if (known) return send(known.status, { message: known.message });
    const status = (error as { status?: number })?.status;
    if (typeof status === 'number' && status >= 400 && status < 500) return send(status, { message: 'Bad request' });
    // The path says which route failed; the context's logger takes share tokens out of it.
    log.error(`Unhandled error on ${req.method} ${req.originalUrl}`, error);
    return send(500, { message: 'Internal server error' });
  };
}

/** 404 JSON for any /api route nobody answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { message: `No API route ${req.method} ${req.originalUrl.split('?')[0]}` } } satisfies ErrorBody);
};
