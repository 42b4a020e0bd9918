/**
 * Measurement-core benchmark (issues 3 and 9). Prints and returns:
 * - readings/s through the production path of a serial CSV meter, end to end on one core:
 *   bytes in 4 KiB chunks into a real SerialSource (its line session: framer, the strict CSV
 *   parser, the frame check and bounds every source applies, the status tracker), delivered
 *   to createRunPipeline().push (integrate and detect). Only the port is a stand-in that hands
 *   the source the bytes a meter would send;
 * - a 24-hour 50 Hz run (4.32 million readings) integrated by the pipeline, with its relative
 *   error against an exactly rounded reference sum of the same trapezoid panels (Shewchuk's
 *   algorithm, as in Python's math.fsum), and the error a plain `+=` sum would have made.
 */
import { EventEmitter } from 'node:events';
import { loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { createRunPipeline } from '../shared/measure/index.js';
import { SerialSourceConfigSchema } from '../shared/schemas/bench.js';
import type { SerialPortLike } from '../server/ingest/sources/serial-port-factory.js';
import { SerialSource } from '../server/ingest/sources/serial-source.js';
import { SECONDS_PER_HOUR } from '../shared/units/time.js';

const THROUGHPUT_LINES = 1_000_000;
const THROUGHPUT_ROUNDS = 5;
const CHUNK_BYTES = 4096;
const RATE_HZ = 50;
const DAY_SECONDS = 24 * SECONDS_PER_HOUR;
const CONFIG = { chemistry: 'lfp', cellsInSeries: 8, endVoltsPerCell: 2.5, ratedAh: 100, ratedWh: 2560, maxGapSeconds: 5 } as const;
const SOURCE = SerialSourceConfigSchema.parse({
  kind: 'serial', path: '/dev/bench-meter', baudRate: 115200, staleAfterSeconds: 10,
  format: { kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'] },
});

/** A slowly sagging 8s LFP discharge at ~0.2 C with ripple: smooth, never reaching the end voltage. */
const volts = (t: number): number => 26.4 - (1.6 * t) / DAY_SECONDS + 0.05 * Math.sin(t / 7);
const amps = (t: number): number => 20 + 0.3 * Math.sin(t / 3) + 0.01 * Math.cos(t * 11);
const temp = (t: number): number => 25 + 3 * Math.sin(t / 3600);

/** Stands in for the serial port: opens at once and hands the source whatever bytes it is given. */
class BytesPort extends EventEmitter implements SerialPortLike {
  isOpen = false;
  open(callback: (err: Error | null) => void): void {
    this.isOpen = true;
    queueMicrotask(() => callback(null));
  }
  close(callback?: (err: Error | null) => void): void {
    this.isOpen = false;
    callback?.(null);
  }
  write(): boolean {
    return true;
  }
}

/** Shewchuk's exactly rounded floating-point sum (the msum/fsum algorithm). */
function fsum(values: Iterable<number>): number {
  const partials: number[] = [];
  for (let x of values) {
    let i = 0;
    for (let y of partials) {
      if (Math.abs(x) < Math.abs(y)) [x, y] = [y, x];
      const hi = x + y;
      const lo = y - (hi - x);
      if (lo !== 0) partials[i++] = lo;
      x = hi;
    }
    partials.length = i;
    partials.push(x);
  }
  return partials.reduce((a, b) => a + b, 0);
}

/** CPU seconds of this process (user + system), so other work on a shared machine does not count. */
const cpuSeconds = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
};

/** The log a meter would send, as bytes cut into the chunks a serial port delivers. */
function meterBytes(): Buffer[] {
  let text = '';
  for (let i = 0; i < THROUGHPUT_LINES; i++) {
    const t = i / RATE_HZ;
    text += `${t},${volts(t).toFixed(4)},${amps(t).toFixed(4)},${temp(t).toFixed(2)}\r\n`;
  }
  const bytes = Buffer.from(text, 'latin1');
  const chunks: Buffer[] = [];
  for (let at = 0; at < bytes.length; at += CHUNK_BYTES) chunks.push(Buffer.from(bytes.subarray(at, at + CHUNK_BYTES)));
  return chunks;
}

async function throughput(): Promise<{ readingsPerSecond: number; readingsPerCpuSecond: number; lines: number; megabytes: number }> {
  const chunks = meterBytes();
  let best = 0;
  let bestCpu = 0;
  for (let round = 0; round < THROUGHPUT_ROUNDS; round++) {
    const pipeline = createRunPipeline(CONFIG);
    let readings = 0;
    let events = 0;
    const port = new BytesPort();
    const source = new SerialSource(SOURCE, {
      frame: (frame) => {
        const out = pipeline.push(frame);
        if (out.reading) readings++;
        events += out.events.length;
      },
      status: () => undefined,
    }, { openPort: () => port });
    source.start();
    await new Promise((resolve) => setImmediate(resolve));
    const cpuStart = cpuSeconds();
    const start = performance.now();
    for (const chunk of chunks) port.emit('data', chunk);
    const seconds = (performance.now() - start) / 1000;
    const cpu = cpuSeconds() - cpuStart;
    await source.stop();
    if (readings !== THROUGHPUT_LINES) throw new Error(`expected ${THROUGHPUT_LINES} readings, got ${readings} (${JSON.stringify(source.getStatus())})`);
    best = Math.max(best, readings / seconds);
    bestCpu = Math.max(bestCpu, readings / cpu);
    if (events < 0) throw new Error('unreachable'); // keeps the work observable
  }
  const megabytes = chunks.reduce((n, c) => n + c.length, 0) / 1e6;
  return { readingsPerSecond: best, readingsPerCpuSecond: bestCpu, lines: THROUGHPUT_LINES, megabytes };
}

function dayAt50Hz(): { readings: number; seconds: number; relErrorAh: number; relErrorWh: number; naiveRelErrorWh: number } {
  const n = DAY_SECONDS * RATE_HZ;
  const p = createRunPipeline(CONFIG);
  // Panels of the same trapezoids, summed exactly afterwards; Float64Array keeps 4.3 M of them cheap.
  const ampPanels = new Float64Array(n - 1);
  const wattPanels = new Float64Array(n - 1);
  let naiveWs = 0;
  let prevT = 0, prevV = volts(0), prevA = amps(0);
  const start = performance.now();
  p.push({ t: 0, volts: prevV, amps: prevA, clock: 'device' });
  for (let i = 1; i < n; i++) {
    const t = i / RATE_HZ;
    const v = volts(t), a = amps(t);
    p.push({ t, volts: v, amps: a, clock: 'device' });
    const dt = t - prevT;
    ampPanels[i - 1] = ((prevA + a) / 2) * dt;
    wattPanels[i - 1] = ((prevV * prevA + v * a) / 2) * dt;
    naiveWs += wattPanels[i - 1]!;
    prevT = t; prevV = v; prevA = a;
  }
  const seconds = (performance.now() - start) / 1000;
  const refAh = fsum(ampPanels) / SECONDS_PER_HOUR;
  const refWh = fsum(wattPanels) / SECONDS_PER_HOUR;
  const got = p.totals();
  return {
    readings: n,
    seconds,
    relErrorAh: Math.abs(got.dischargeAh - refAh) / refAh,
    relErrorWh: Math.abs(got.dischargeWh - refWh) / refWh,
    naiveRelErrorWh: Math.abs(naiveWs / SECONDS_PER_HOUR - refWh) / refWh,
  };
}

/** Runs the benchmark, prints its figures and returns them. */
export async function run(): Promise<Record<string, string | number>> {
  const [loadBefore] = loadavg();
  const tp = await throughput();
  const fmt = (x: number): string => Math.round(x).toLocaleString('en-US');
  console.log(`bytes → framer → CSV parser → frame check → pipeline: ${fmt(tp.readingsPerSecond)} readings/s wall clock, ${fmt(tp.readingsPerCpuSecond)} per CPU second (best of ${THROUGHPUT_ROUNDS} × ${tp.lines.toLocaleString('en-US')} lines, ${tp.megabytes.toFixed(1)} MB in ${CHUNK_BYTES} B chunks, one thread; target ≥ 1,000,000; load average ${loadBefore!.toFixed(1)})`);
  const day = dayAt50Hz();
  console.log(`24 h at 50 Hz: ${day.readings.toLocaleString('en-US')} readings through the pipeline in ${day.seconds.toFixed(2)} s`);
  console.log(`  relative error vs exactly rounded reference: Ah ${day.relErrorAh.toExponential(2)}, Wh ${day.relErrorWh.toExponential(2)} (target < 1e-9); plain += sum would be ${day.naiveRelErrorWh.toExponential(2)}`);
  return {
    readingsPerSecond: Math.round(tp.readingsPerSecond),
    readingsPerCpuSecond: Math.round(tp.readingsPerCpuSecond),
    loadAverage1m: loadBefore!.toFixed(1),
    dayReadings: day.readings,
    daySeconds: Number(day.seconds.toFixed(2)),
    dayRelErrorAh: day.relErrorAh,
    dayRelErrorWh: day.relErrorWh,
    dayNaiveRelErrorWh: day.naiveRelErrorWh,
  };
}
