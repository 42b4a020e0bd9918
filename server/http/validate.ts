import type { z } from 'zod';
import { HttpError } from './http-error.js';

/** Parses `value` with `schema`; a failure becomes the 400 the error handler formats with field names. */
export function parseBody<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  return schema.parse(value ?? {});
}

/** Parses a positive integer route parameter such as `:id`, or answers 400. */
export function parseIdParam(value: string | string[] | undefined, name = 'id'): number {
  const text = Array.isArray(value) ? value[0] : value;
  // Digits only: Number() would also take "0x1", "1e3", " 1" and "1.0" as ids.
  const id = text && /^[1-9][0-9]*$/.test(text) ? Number(text) : Number.NaN;
  if (!Number.isSafeInteger(id)) {
    throw new HttpError(400, `Invalid ${name}: expected a positive whole number`, { [name]: ['expected a positive whole number'] });
  }
  return id;
}
