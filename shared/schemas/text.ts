import { z } from 'zod';

/** C0 and C1 control characters (NUL, escape, line breaks, …) and DEL. */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u001F\u007F-\u009F]/;
/** The same, but line breaks and tabs are allowed (multi-line notes). */
// eslint-disable-next-line no-control-regex
const CONTROL_EXCEPT_LINES = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;
/** Something a reader can see: not whitespace, not a control or invisible format character. */
const VISIBLE = /[^\s\p{Cc}\p{Cf}]/u;

/**
 * A one-line label (a name, a brand, a tag): trimmed, 1 to `max` characters, at least one
 * visible character, and no control characters, so NUL-only or escape-laden labels are refused.
 */
export const labelText = (max: number) =>
  z
    .string()
    .trim()
    .min(1)
    .max(max)
    .refine((s) => !CONTROL.test(s), 'must not contain control characters (such as NUL or line breaks)')
    .refine((s) => VISIBLE.test(s), 'must contain visible characters');

/**
 * Free text over several lines (notes, annotations): trimmed, at most `max` characters,
 * line breaks and tabs allowed, other control characters refused. `min` 1 also requires a
 * visible character.
 */
export const noteText = (max: number, min = 0) =>
  z
    .string()
    .trim()
    .min(min)
    .max(max)
    .refine((s) => !CONTROL_EXCEPT_LINES.test(s), 'must not contain control characters (such as NUL)')
    .refine((s) => min === 0 || VISIBLE.test(s), 'must contain visible characters');

/** An optional one-line field: like labelText, but empty is allowed (nothing entered). */
export const optionalLabelText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .refine((s) => !CONTROL.test(s), 'must not contain control characters (such as NUL or line breaks)')
    .refine((s) => s === '' || VISIBLE.test(s), 'must contain visible characters');
