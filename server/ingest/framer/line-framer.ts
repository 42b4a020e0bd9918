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
   * chunk). Lines are cut by a character scan: no regex and no trimmed copy per line.
   */
  pushInto(chunk: Buffer | string, out: string[]): void {
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
      let line: string;
      if (this.pending === '') {
        if (end > from && text.charCodeAt(end - 1) === CODE_CR) end--;
        line = text.slice(from, end);
      } else {
        line = this.pending + text.slice(from, end);
        this.pending = '';
        if (line.charCodeAt(line.length - 1) === CODE_CR) line = line.slice(0, -1);
      }
      if (line.length > this.maxLineBytes) {
        this.droppedLines++;
        continue;
      }
      if (!isBlankSpan(line, 0, line.length)) out.push(line);
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
