/** Sequelize's names for "could not reach the database" (as opposed to an SQL error). */
const CONNECTION_ERROR_NAMES = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionTimedOutError',
  'SequelizeConnectionAcquireTimeoutError',
  'SequelizeHostNotFoundError',
  'SequelizeHostNotReachableError',
  'SequelizeInvalidConnectionError',
  'DatabaseUnavailableError',
]);

/** Thrown instead of running a query while the database is known to be away or stalled. */
export class DatabaseUnavailableError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DatabaseUnavailableError';
  }
}

/**
 * True when `err` means the database could not be reached or the connection broke mid-query
 * (retrying later can succeed), false for an SQL error. The mariadb driver marks a broken
 * connection `fatal` (a socket closed by a killed server arrives as a plain DatabaseError).
 */
export function isConnectionFailure(err: unknown): boolean {
  const e = err as { name?: string; fatal?: boolean; parent?: { fatal?: boolean }; original?: { fatal?: boolean } } | undefined;
  if (!e) return false;
  if (CONNECTION_ERROR_NAMES.has(e.name ?? '')) return true;
  return e.fatal === true || e.parent?.fatal === true || e.original?.fatal === true;
}
