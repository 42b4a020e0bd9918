/**
 * Client figures: the live chart's per-frame work. uPlot's setData runs at most once per
 * animation frame (16.7 ms at 60 Hz); before it, the ring buffer is copied oldest-first into
 * the chart's reusable arrays. This measures that copy for a full window, and the push rate.
 */
import { performance } from 'node:perf_hooks';
import { ColumnarRingBuffer } from '../src/lib/ring-buffer.js';

/** Same window as src/lib/live-store.ts: 15 min at 10 Hz, five columns. */
const WINDOW_ROWS = 9_000;
const COLUMNS = 5;
const PUSHES = 2_000_000;
const COPIES = 500;
const FRAME_BUDGET_MS = 1000 / 60;

/** Prints and returns push rate and full-window copy time. */
export async function run(): Promise<Record<string, string | number>> {
  const buffer = new ColumnarRingBuffer(COLUMNS, WINDOW_ROWS);
  const row = [0, 12.8, 20, 256, 25];
  let t0 = performance.now();
  for (let i = 0; i < PUSHES; i++) {
    row[0] = i / 10;
    buffer.push(row);
  }
  const pushMs = performance.now() - t0;
  const out: (number | null)[][] = Array.from({ length: COLUMNS }, () => []);
  buffer.copyOrdered(out); // warm the arrays to full length once
  t0 = performance.now();
  for (let i = 0; i < COPIES; i++) buffer.copyOrdered(out);
  const copyMs = (performance.now() - t0) / COPIES;
  const figures = {
    ringPushesPerSecond: Math.round(PUSHES / (pushMs / 1000)),
    fullWindowCopyMs: Number(copyMs.toFixed(3)),
    copyShareOfFrameBudgetPct: Number(((copyMs / FRAME_BUDGET_MS) * 100).toFixed(1)),
  };
  console.log(
    `ring buffer: ${figures.ringPushesPerSecond.toLocaleString('en-US')} pushes/s; copying a full ${WINDOW_ROWS}-row window: ${figures.fullWindowCopyMs} ms ` +
      `(${figures.copyShareOfFrameBudgetPct} % of a 60 Hz frame)`,
  );
  return figures;
}
