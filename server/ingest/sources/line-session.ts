import type { CsvFormat, JsonlFormat } from '../../../shared/schemas/bench.js';
import { LineFramer } from '../framer/line-framer.js';
import { createSpanParser } from '../parsers/line-parser.js';
import type { PortSession, SessionContext } from './port-session.js';

/** Reads a meter that streams text lines (CSV or JSON lines): bytes → framer → parser → frames. */
export function startLineSession(ctx: SessionContext, format: CsvFormat | JsonlFormat): PortSession {
  const framer = new LineFramer();
  const parse = createSpanParser(format);
  let dropped = 0;
  // The first bytes after opening may be the tail of a line sent before we listened.
  let first = true;
  let arrivalMs = 0;
  // One callback for every line: lines are parsed where they lie in the chunk's text.
  const onLine = (text: string, start: number, end: number): void => {
    const result = parse(text, start, end, arrivalMs);
    if (result.kind === 'frame') ctx.emitFrame(result.frame);
    else if (result.kind === 'rejected' && !first) ctx.tracker.rejected(result.reason);
    first = false;
  };
  const onData = (chunk: Buffer): void => {
    // Every line of a chunk arrived together: one arrival stamp for the chunk.
    arrivalMs = ctx.clock.nowMs();
    framer.forEachLine(chunk, onLine);
    if (framer.droppedLines > dropped) {
      for (; dropped < framer.droppedLines; dropped++) ctx.tracker.rejected('line too long (wrong baud rate or no line ending?)');
    }
  };
  ctx.port.on('data', onData);
  return { stop: () => ctx.port.off('data', onData) };
}
