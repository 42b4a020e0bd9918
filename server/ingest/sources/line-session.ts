import type { CsvFormat, JsonlFormat } from '../../../shared/schemas/bench.js';
import { LineFramer } from '../framer/line-framer.js';
import { createLineParser } from '../parsers/line-parser.js';
import type { PortSession, SessionContext } from './port-session.js';

/** Reads a meter that streams text lines (CSV or JSON lines): bytes → framer → parser → frames. */
export function startLineSession(ctx: SessionContext, format: CsvFormat | JsonlFormat): PortSession {
  const framer = new LineFramer();
  const parse = createLineParser(format);
  let dropped = 0;
  // The first bytes after opening may be the tail of a line sent before we listened.
  let first = true;
  // One array for every chunk's lines: reading a stream allocates nothing per chunk but the lines.
  const lines: string[] = [];
  const onData = (chunk: Buffer): void => {
    lines.length = 0;
    framer.pushInto(chunk, lines);
    if (framer.droppedLines > dropped) {
      for (; dropped < framer.droppedLines; dropped++) ctx.tracker.rejected('line too long (wrong baud rate or no line ending?)');
    }
    // Every line of a chunk arrived together: one arrival stamp for the chunk.
    const arrivalMs = ctx.clock.nowMs();
    for (const line of lines) {
      const result = parse(line, arrivalMs);
      if (result.kind === 'frame') ctx.emitFrame(result.frame);
      else if (result.kind === 'rejected' && !first) ctx.tracker.rejected(result.reason);
      first = false;
    }
  };
  ctx.port.on('data', onData);
  return { stop: () => ctx.port.off('data', onData) };
}
