/** Character codes the field scanner looks at. */
const CODE_QUOTE = 34;
const CODE_HASH = 35;
const CODE_SPACE = 32;
const INITIAL_FIELDS = 16;

/**
 * Where the fields of one CSV line lie, as `[start, end)` offsets into the line, trimmed of
 * blanks (a quoted field: the text inside its quotes). Reused from line to line, so reading
 * a line allocates no strings and no arrays.
 */
export class FieldSpans {
  starts = new Int32Array(INITIAL_FIELDS);
  ends = new Int32Array(INITIAL_FIELDS);
  /** 1 where a quoted field holds a doubled quote (`""`) and its text needs unescaping. */
  escaped = new Uint8Array(INITIAL_FIELDS);
  count = 0;

  /** The text of field `i` (a string is made only here, for headers, messages and dates). */
  text(line: string, i: number): string {
    const raw = line.slice(this.starts[i]!, this.ends[i]!);
    return this.escaped[i] === 1 ? raw.replaceAll('""', '"') : raw;
  }

  /** Every field as text (for a header row). */
  texts(line: string): string[] {
    const out = new Array<string>(this.count);
    for (let i = 0; i < this.count; i++) out[i] = this.text(line, i);
    return out;
  }

  add(start: number, end: number, escaped: boolean): void {
    if (this.count === this.starts.length) this.grow();
    this.starts[this.count] = start;
    this.ends[this.count] = end;
    this.escaped[this.count] = escaped ? 1 : 0;
    this.count++;
  }

  private grow(): void {
    const size = this.starts.length * 2;
    const starts = new Int32Array(size);
    const ends = new Int32Array(size);
    const escaped = new Uint8Array(size);
    starts.set(this.starts);
    ends.set(this.ends);
    escaped.set(this.escaped);
    this.starts = starts;
    this.ends = ends;
    this.escaped = escaped;
  }
}

/** The blanks String.prototype.trim removes (JavaScript's white space and line terminators). */
export function isBlank(c: number): boolean {
  if (c <= CODE_SPACE) return c === CODE_SPACE || (c >= 9 && c <= 13);
  return c === 0xa0 || c === 0x1680 || (c >= 0x2000 && c <= 0x200a) || c === 0x2028 || c === 0x2029 || c === 0x202f || c === 0x205f || c === 0x3000 || c === 0xfeff;
}

/** True when `line[start, end)` holds only blanks. */
export function isBlankSpan(line: string, start: number, end: number): boolean {
  for (let i = start; i < end; i++) if (!isBlank(line.charCodeAt(i))) return false;
  return true;
}

function addTrimmed(spans: FieldSpans, line: string, start: number, end: number): void {
  while (start < end && isBlank(line.charCodeAt(start))) start++;
  while (end > start && isBlank(line.charCodeAt(end - 1))) end--;
  spans.add(start, end, false);
}

/**
 * Splits a meter's line on a one-character delimiter, each field trimmed, as
 * `line.split(delimiter).map(trim)` does; the delimiter `' '` splits on runs of blanks and
 * ignores leading ones, as `split(/\s+/)` without its leading empty field. No quoting:
 * meters write plain numbers. `lineStart`/`lineEnd` bound the line within `line` (a chunk of text).
 */
export function splitPlain(line: string, delimiter: string, spans: FieldSpans, lineStart = 0, lineEnd = line.length): void {
  spans.count = 0;
  const end = lineEnd;
  if (delimiter === ' ') {
    // ''.split(/\s+/) is [''], and its leading empty field goes: no field at all.
    if (end === lineStart) return;
    let i = lineStart;
    while (i < end && isBlank(line.charCodeAt(i))) i++;
    let from = i;
    for (; i < end; i++) {
      if (!isBlank(line.charCodeAt(i))) continue;
      spans.add(from, i, false);
      while (i + 1 < end && isBlank(line.charCodeAt(i + 1))) i++;
      from = i + 1;
    }
    spans.add(from, end, false);
    return;
  }
  const d = delimiter.charCodeAt(0);
  let from = lineStart;
  for (let i = lineStart; i < end; i++) {
    if (line.charCodeAt(i) !== d) continue;
    addTrimmed(spans, line, from, i);
    from = i + 1;
  }
  addTrimmed(spans, line, from, end);
}

/** How a record of a log file read: fields found, or what is wrong with its quotes. */
export type RecordSplit = 'ok' | 'empty' | 'open-quote' | 'quote-in-field' | 'text-after-quote';

/**
 * Splits one record of a log file (RFC 4180 quoting: a field may be wrapped in double
 * quotes, which may hold the delimiter, line breaks and doubled quotes; blanks around
 * fields are trimmed; `#` outside quotes starts a comment to the end of the record).
 * `empty`: nothing but blanks or a comment; `open-quote`: a quote still open at the end (the
 * caller joins the next line and tries again).
 */
export function splitRecord(line: string, delimiter: string, spans: FieldSpans): RecordSplit {
  spans.count = 0;
  const d = delimiter.charCodeAt(0);
  let end = line.length;
  let i = 0;
  for (;;) {
    while (i < end && isBlank(line.charCodeAt(i)) && line.charCodeAt(i) !== d) i++;
    if (i < end && line.charCodeAt(i) === CODE_HASH) {
      end = i;
      if (spans.count === 0) return 'empty';
    }
    if (i < end && line.charCodeAt(i) === CODE_QUOTE) {
      const from = i + 1;
      let escaped = false;
      let j = from;
      for (;;) {
        const q = line.indexOf('"', j);
        if (q < 0) return 'open-quote';
        if (line.charCodeAt(q + 1) === CODE_QUOTE) {
          escaped = true;
          j = q + 2;
          continue;
        }
        spans.add(from, q, escaped);
        i = q + 1;
        break;
      }
      while (i < end && isBlank(line.charCodeAt(i)) && line.charCodeAt(i) !== d) i++;
      if (i < end && line.charCodeAt(i) === CODE_HASH) end = i;
      if (i >= end) return 'ok';
      if (line.charCodeAt(i) !== d) return 'text-after-quote';
      i++;
      continue;
    }
    const from = i;
    for (; i < end; i++) {
      const c = line.charCodeAt(i);
      if (c === d) break;
      if (c === CODE_QUOTE) return 'quote-in-field';
      if (c === CODE_HASH) {
        end = i;
        break;
      }
    }
    addTrimmed(spans, line, from, i);
    if (i >= end) {
      return spans.count === 1 && spans.starts[0] === spans.ends[0] && isBlankSpan(line, 0, end) ? 'empty' : 'ok';
    }
    i++;
  }
}
