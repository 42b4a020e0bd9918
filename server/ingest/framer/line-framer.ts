import { isBlankSpan } from '../parsers/csv-fields.js';

const CODE_CR = 13;

/** Longest line a meter is expected to send; a longer run of bytes is noise or a wrong baud rate. */
export const DEFAULT_MAX_LINE_BYTES = 1024;

/**
 * Cuts a byte stream into text lines (LF or CRLF) with a bounded buffer. An over-long
 * line is dropped whole (up to its end) and counted, so one garbled burst never grows
 * memory nor glues two good lines together.
 */
export class LineFramer {
  private pending = '';
  private discarding = false;
  /** Lines dropped because they exceeded the limit. */
  droppedLines = 0;

  constructor(private readonly maxLineBytes = DEFAULT_MAX_LINE_BYTES) {}

  /** Feeds a chunk and returns the complete lines it finished, without line endings; empty lines are skipped. */
  push(chunk: Buffer | string): string[] {
    const lines: string[] = [];
    this.pushInto(chunk, lines);
    return lines;
  }

  /**
   * Appends the lines a chunk finishes to `out` (the caller may reuse one array from chunk to
   * chunk).
   */
  pushInto(chunk: Buffer | string, out: string[]): void {
    this.forEachLine(chunk, (text, start, end) => void out.push(start === 0 && end === text.length ? text : text.slice(start, end)));
  }

  /**
   * Calls `onLine(text, start, end)` for each line a chunk finishes, in order: the line is
   * `text[start, end)`, usually a stretch of the chunk's own text, so no string is cut per
   * line (a line that began in an earlier chunk comes joined, as a string of its own). Lines
   * are found by a character scan: no regex and no trimmed copy per line.
   */
  forEachLine(chunk: Buffer | string, onLine: (text: string, start: number, end: number) => void): void {
    const text = typeof chunk === 'string' ? chunk : chunk.toString('latin1');
    let start = 0;
    for (;;) {
      const nl = text.indexOf('\n', start);
      if (nl < 0) break;
      let end = nl;
      const from = start;
      start = nl + 1;
      if (this.discarding) {
        // The tail of an over-long line: it was counted when it overflowed.
        this.discarding = false;
        this.pending = '';
        continue;
      }
      if (this.pending === '') {
        if (end > from && text.charCodeAt(end - 1) === CODE_CR) end--;
        if (end - from > this.maxLineBytes) {
          this.droppedLines++;
          continue;
        }
        if (!isBlankSpan(text, from, end)) onLine(text, from, end);
        continue;
      }
      let line = this.pending + text.slice(from, end);
      this.pending = '';
      if (line.charCodeAt(line.length - 1) === CODE_CR) line = line.slice(0, -1);
      if (line.length > this.maxLineBytes) {
        this.droppedLines++;
        continue;
      }
      if (!isBlankSpan(line, 0, line.length)) onLine(line, 0, line.length);
    }
    this.appendPending(start === 0 ? text : text.slice(start));
  }

  /** Forgets a partial line (after a reconnect the first bytes may be the tail of an old line). */
  reset(): void {
    this.pending = '';
    this.discarding = false;
  }

  private appendPending(rest: string): void {
    if (this.discarding || rest === '') return;
    this.pending += rest;
    if (this.pending.length > this.maxLineBytes) {
      this.droppedLines++;
      this.pending = '';
      this.discarding = true;
    }
  }
}
