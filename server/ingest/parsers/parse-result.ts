import type { Frame } from '../../../shared/schemas/frame.js';

/** What a parser makes of one line or reply: a frame, a counted rejection with its reason, or a line to ignore (a header). */
export type ParseResult =
  | { kind: 'frame'; frame: Frame }
  | { kind: 'rejected'; reason: string }
  | { kind: 'skipped' };

/** Builds a rejection. */
export function reject(reason: string): ParseResult {
  return { kind: 'rejected', reason };
}

/** A parser for one text line; `arrivalMs` stamps frames whose meter sends no time. */
export type LineParser = (line: string, arrivalMs: number) => ParseResult;

/** A parser of one text line given in place: `text[start, end)` (so a framer need not cut a string per line). */
export type SpanParser = (text: string, start: number, end: number, arrivalMs: number) => ParseResult;

const MAX_ECHO_CHARS = 24;

/** Shortens a bad value for a rejection message, so a garbled line never floods the status. */
export function clip(text: string): string {
  return text.length > MAX_ECHO_CHARS ? `${text.slice(0, MAX_ECHO_CHARS)}…` : text;
}
