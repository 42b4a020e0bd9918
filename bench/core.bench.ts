/**
 * Measurement-core benchmark (issue 3). Prints and returns:
 * - readings/s through parseCsvLine → integrate → detect (createRunPipeline().push) on one core;
 * - a 24-hour 50 Hz run (4.32 million readings) integrated by the pipeline, with its relative
 *   error against an exactly rounded reference sum of the same trapezoid panels (Shewchuk's
 *   algorithm, as in Python's math.fsum), and the error a plain `+=` sum would have made.
 */
import { performance } from 'node:perf_hooks';
import { createRunPipeline, parseCsvLine, type CsvLayout } from '../shared/measure/index.js';
import { SECONDS_PER_HOUR } from '../shared/units/time.js';

const THROUGHPUT_LINES = 1_000_000;
const THROUGHPUT_ROUNDS = 5;
const RATE_HZ = 50;
const DAY_SECONDS = 24 * SECONDS_PER_HOUR;
const LAYOUT: CsvLayout = { t: 0, volts: 1, amps: 2, temps: { cell: 3 } };
const CONFIG = { chemistry: 'lfp', cellsInSeries: 8, endVoltsPerCell: 2.5, ratedAh: 100, ratedWh: 2560, maxGapSeconds: 5 } as const;

/** A slowly sagging 8s LFP discharge at ~0.2 C with ripple: smooth, never reaching the end voltage. */
const volts = (t: number): number => 26.4 - (1.6 * t) / DAY_SECONDS + 0.05 * Math.sin(t / 7);
const amps = (t: number): number => 20 + 0.3 * Math.sin(t / 3) + 0.01 * Math.cos(t * 11);
const temp = (t: number): number => 25 + 3 * Math.sin(t / 3600);

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

function throughput(): { readingsPerSecond: number; readingsPerCpuSecond: number; lines: number } {
  const lines = new Array<string>(THROUGHPUT_LINES);
  for (let i = 0; i < THROUGHPUT_LINES; i++) {
    const t = i / RATE_HZ;
    lines[i] = `${t},${volts(t).toFixed(4)},${amps(t).toFixed(4)},${temp(t).toFixed(2)}`;
  }
  let best = 0;
  let bestCpu = 0;
  for (let round = 0; round < THROUGHPUT_ROUNDS; round++) {
    const p = createRunPipeline(CONFIG);
    let events = 0;
    const cpuStart = cpuSeconds();
    const start = performance.now();
    for (let i = 0; i < lines.length; i++) {
      const r = parseCsvLine(lines[i]!, LAYOUT);
      if (r.ok) events += p.push(r.frame).events.length;
    }
    const seconds = (performance.now() - start) / 1000;
    best = Math.max(best, lines.length / seconds);
    bestCpu = Math.max(bestCpu, lines.length / (cpuSeconds() - cpuStart));
    if (events < 0) throw new Error('unreachable'); // keeps the work observable
  }
  return { readingsPerSecond: best, readingsPerCpuSecond: bestCpu, lines: THROUGHPUT_LINES };
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
  const tp = throughput();
  const fmt = (x: number): string => Math.round(x).toLocaleString('en-US');
  console.log(`parse → integrate → detect: ${fmt(tp.readingsPerSecond)} readings/s wall clock, ${fmt(tp.readingsPerCpuSecond)} per CPU second (best of ${THROUGHPUT_ROUNDS} × ${tp.lines.toLocaleString('en-US')} CSV lines, one thread; target ≥ 1,000,000)`);
  const day = dayAt50Hz();
  console.log(`24 h at 50 Hz: ${day.readings.toLocaleString('en-US')} readings through the pipeline in ${day.seconds.toFixed(2)} s`);
  console.log(`  relative error vs exactly rounded reference: Ah ${day.relErrorAh.toExponential(2)}, Wh ${day.relErrorWh.toExponential(2)} (target < 1e-9); plain += sum would be ${day.naiveRelErrorWh.toExponential(2)}`);
  return {
    readingsPerSecond: Math.round(tp.readingsPerSecond),
    readingsPerCpuSecond: Math.round(tp.readingsPerCpuSecond),
    dayReadings: day.readings,
    daySeconds: Number(day.seconds.toFixed(2)),
    dayRelErrorAh: day.relErrorAh,
    dayRelErrorWh: day.relErrorWh,
    dayNaiveRelErrorWh: day.naiveRelErrorWh,
  };
}
