import { ConflictError, DomainError, ForbiddenError, InvalidInputError, NotFoundError, UnavailableError } from '../domain/domain-errors.js';

/** HTTP statuses of the domain errors: the one place they meet. */
const STATUS_OF_DOMAIN_ERROR: readonly [new (...args: never[]) => DomainError, number][] = [
  [InvalidInputError, 400],
  [ForbiddenError, 403],
  [NotFoundError, 404],
  [ConflictError, 409],
  [UnavailableError, 503],
];
/**
 * The status a domain error answers with; undefined when `error` is no domain error or of a
 * kind not listed (the handler then answers 500 and logs it, as for any unexpected error).
 */
export function domainErrorStatus(error: unknown): number | undefined {
  if (!(error instanceof DomainError)) return undefined;
  return STATUS_OF_DOMAIN_ERROR.find(([kind]) => error instanceof kind)?.[1];
}
