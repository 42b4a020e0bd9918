/**
 * Ingest benchmark (issue 5). Prints and returns frames/s through the bounded line framer
 * and the parser, for CSV (four columns with a time column) and JSON lines (with nested
 * temps), fed in 4 KiB chunks as a serial port delivers them. One core, best of three rounds.
 * For scale: a real 115200-baud line carries about 300 such frames/s (MACHINE-FACTS).
 */
import { performance } from 'node:perf_hooks';
import { CsvFormatSchema, JsonlFormatSchema } from '../shared/schemas/bench.js';
import { LineFramer } from '../server/ingest/framer/line-framer.js';
import { createLineParser } from '../server/ingest/parsers/line-parser.js';

const FRAMES = 500_000;
const ROUNDS = 3;
const CHUNK_BYTES = 4096;
const ARRIVAL_MS = Date.UTC(2026, 0, 1);

const csvFormat = CsvFormatSchema.parse({ kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'] });
const jsonlFormat = JsonlFormatSchema.parse({ kind: 'jsonl' });

function csvLine(i: number): string {
  return `${(i * 0.1).toFixed(1)},${(13.3 - i * 1e-6).toFixed(3)},${(45 + (i % 7) * 0.01).toFixed(3)},${(23 + (i % 50) * 0.1).toFixed(1)}\r\n`;
}
function jsonLine(i: number): string {
  const frame = { t: i * 0.1, volts: 13.3 - i * 1e-6, amps: 45 + (i % 7) * 0.01, temps: { cell: 23.5, ambient: 22 }, clock: 'device', seq: i };
  return `${JSON.stringify(frame)}\n`;
}

/** The stream cut into fixed-size chunks, so lines straddle chunk borders as on a real port. */
function chunks(makeLine: (i: number) => string): Buffer[] {
  const all = Buffer.from(Array.from({ length: FRAMES }, (_v, i) => makeLine(i)).join(''), 'latin1');
  const out: Buffer[] = [];
  for (let at = 0; at < all.length; at += CHUNK_BYTES) out.push(all.subarray(at, at + CHUNK_BYTES));
  return out;
}

function measure(label: string, input: Buffer[], format: Parameters<typeof createLineParser>[0]): number {
  let best = 0;
  for (let round = 0; round < ROUNDS; round++) {
    const framer = new LineFramer();
    const parse = createLineParser(format);
    let ok = 0;
    const start = performance.now();
    for (const chunk of input) for (const line of framer.push(chunk)) if (parse(line, ARRIVAL_MS).kind === 'frame') ok++;
    const seconds = (performance.now() - start) / 1000;
    if (ok !== FRAMES) throw new Error(`${label}: parsed ${ok} of ${FRAMES} frames`);
    best = Math.max(best, FRAMES / seconds);
  }
  console.log(`${label}: ${Math.round(best).toLocaleString('en-GB')} frames/s (framer + parser, ${FRAMES.toLocaleString('en-GB')} frames)`);
  return Math.round(best);
}

/** Runs the ingest benchmark and returns its figures. */
export async function run(): Promise<Record<string, string | number>> {
  return {
    csvFramesPerS: measure('CSV', chunks(csvLine), csvFormat),
    jsonlFramesPerS: measure('JSON lines', chunks(jsonLine), jsonlFormat),
  };
}
