import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { ConflictError, DomainError, ForbiddenError, InvalidInputError, notFound, UnavailableError } from '../domain/domain-errors.js';
import { domainErrorStatus } from './domain-error-status.js';
import { createErrorHandler } from './error-handler.js';
import { quietLogger } from '../log/logger.js';

// Statuses as RFC 9110 section 15 defines them (400 Bad Request, 403 Forbidden, 404 Not Found,
// 409 Conflict, 503 Service Unavailable).
describe('domain errors at the HTTP edge', () => {
  it('maps each kind of domain error to its status, and nothing else', () => {
    expect(domainErrorStatus(new InvalidInputError('x'))).toBe(400);
    expect(domainErrorStatus(new ForbiddenError('x'))).toBe(403);
    expect(domainErrorStatus(notFound('Run 7'))).toBe(404);
    expect(domainErrorStatus(new ConflictError('x'))).toBe(409);
    expect(domainErrorStatus(new UnavailableError('x'))).toBe(503);
    expect(domainErrorStatus(new Error('x'))).toBeUndefined();
    class Unlisted extends DomainError {}
    expect(domainErrorStatus(new Unlisted('x'))).toBeUndefined();
  });

  it('answers a domain error thrown by a route with its status, message and fields; an unlisted kind is a plain 500', async () => {
    const app = express();
    const logged: string[] = [];
    app.get('/missing', () => {
      throw notFound('Run 7');
    });
    app.get('/bad', () => {
      throw new InvalidInputError('line 3: volts "abc" is not a number', { volts: ['not a number'] });
    });
    app.get('/odd', () => {
      throw new (class Odd extends DomainError {})('internal detail');
    });
    app.use(createErrorHandler({ ...quietLogger, error: (m) => void logged.push(m) }));
    const missing = await request(app).get('/missing');
    expect([missing.status, missing.body]).toEqual([404, { error: { message: 'Run 7 not found' } }]);
    const bad = await request(app).get('/bad');
    expect([bad.status, bad.body]).toEqual([400, { error: { message: 'line 3: volts "abc" is not a number', fields: { volts: ['not a number'] } } }]);
    const odd = await request(app).get('/odd');
    expect([odd.status, odd.body.error.message, logged.length]).toEqual([500, 'Internal server error', 1]);
  });
});
