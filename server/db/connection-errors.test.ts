import { describe, expect, it } from 'vitest';
import { ConnectionRefusedError, DatabaseError, ValidationError } from 'sequelize';
import { DatabaseUnavailableError, isConnectionFailure } from './connection-errors.js';
import { isTransient } from '../archive/archive-service.js';

/** An error as the mariadb driver raises it (SqlError carries `fatal` and `code`). */
const driverError = (code: string, fatal: boolean) => Object.assign(new Error(code), { code, fatal, sql: 'INSERT …' });

describe('connection failures', () => {
  it('counts a refused connection, our own refusal, and a connection the killed server closed mid-query', () => {
    expect(isConnectionFailure(new ConnectionRefusedError(new Error('ECONNREFUSED')))).toBe(true);
    expect(isConnectionFailure(new DatabaseUnavailableError('away'))).toBe(true);
    // A socket closed under a running query arrives from Sequelize as a plain DatabaseError with a fatal cause.
    expect(isConnectionFailure(new DatabaseError(driverError('ER_SOCKET_UNEXPECTED_CLOSE', true) as never))).toBe(true);
  });

  it('does not count an SQL error or a validation error', () => {
    expect(isConnectionFailure(new DatabaseError(driverError('ER_NO_SUCH_TABLE', false) as never))).toBe(false);
    expect(isConnectionFailure(new ValidationError('bad', []))).toBe(false);
    expect(isConnectionFailure(undefined)).toBe(false);
  });

  it('makes the archive wait out a broken connection instead of setting the batch aside', () => {
    expect(isTransient(new DatabaseError(driverError('ER_SOCKET_UNEXPECTED_CLOSE', true) as never))).toBe(true);
    expect(isTransient(new DatabaseError(driverError('ER_NO_SUCH_TABLE', false) as never))).toBe(false);
  });
});
