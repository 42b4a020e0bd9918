/**
 * The errors domain code throws. They say what went wrong in words a person can act on,
 * and optionally which input fields it concerns; they know nothing of HTTP. Only
 * server/http/ maps them to statuses (domain-error-status.ts).
 */

/** Base of every domain error: a message safe to show, and the fields it concerns. */
export abstract class DomainError extends Error {
  constructor(
    message: string,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** The input breaks a rule: a value out of range, a file that cannot be read as asked. */
export class InvalidInputError extends DomainError {}

/** The thing asked for does not exist. */
export class NotFoundError extends DomainError {}

/** The request clashes with the present state (a run already recording on the bench). */
export class ConflictError extends DomainError {}

/** The person may not do this to this thing (another user's note). */
export class ForbiddenError extends DomainError {}

/** A part of the server the request needs is not running (live recording, alarms). */
export class UnavailableError extends DomainError {}

/** A NotFoundError naming what was not found ("Run 7 not found"). */
export const notFound = (what: string) => new NotFoundError(`${what} not found`);
