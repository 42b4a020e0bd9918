/** An error with an HTTP status and a message safe to show to the client. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

/** 404 with a message naming what was not found. */
export const notFound = (what: string) => new HttpError(404, `${what} not found`);
