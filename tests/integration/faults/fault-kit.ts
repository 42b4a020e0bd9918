import { spawn, type ChildProcess } from 'node:child_process';
import { closeSync, openSync, writeSync } from 'node:fs';
import { createServer } from 'node:net';
import { resolve } from 'node:path';
import { xyIntegration } from 'ml-spectra-processing';
import { openPtyPair, type PtyPair } from '../../../simulator/transport/socat.js';
import { SECONDS_PER_HOUR } from '../../../shared/units/time.js';

/** A free TCP port on loopback, chosen by the OS. */
export function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const probe = createServer();
    probe.once('error', fail);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => ok(port));
    });
  });
}

const READY_LINE = 'Kneepoint is serving';
const START_TIMEOUT_MS = 60_000;

/**
 * Kneepoint as users run it: `server/index.ts` in a child process of its own (through tsx),
 * configured by environment only, so the test can SIGKILL or SIGTERM it like an operator.
 */
export class ServerProcess {
  private child: ChildProcess | null = null;
  /** Everything the server printed, for a failing test's message. */
  output = '';

  constructor(readonly env: Record<string, string>) {}

  /** Starts the server and resolves once it listens. */
  async start(): Promise<void> {
    const child = spawn(process.execPath, ['--import', 'tsx', resolve('server/index.ts')], {
      env: { ...process.env, ...this.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    this.child = child;
    await new Promise<void>((ok, fail) => {
      const timer = setTimeout(() => fail(new Error(`server did not start within ${START_TIMEOUT_MS} ms:\n${this.output}`)), START_TIMEOUT_MS);
      const onData = (chunk: Buffer) => {
        this.output += chunk.toString();
        if (this.output.includes(READY_LINE)) {
          clearTimeout(timer);
          ok();
        }
      };
      child.stdout!.on('data', onData);
      child.stderr!.on('data', (chunk: Buffer) => (this.output += chunk.toString()));
      child.once('exit', (code, signal) => {
        clearTimeout(timer);
        fail(new Error(`server exited (${code ?? signal}) before listening:\n${this.output}`));
      });
    });
    this.output = this.output.replace(READY_LINE, 'served');
  }

  /** Sends a signal and waits for the process to be gone. */
  async stop(signal: 'SIGKILL' | 'SIGTERM'): Promise<void> {
    const child = this.child;
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise<void>((ok) => child.once('exit', () => ok()));
    child.kill(signal);
    await exited;
    this.child = null;
  }
}

/** One line the meter sent: its frame and when (performance.now ms). */
export interface SentFrame {
  t: number;
  volts: number;
  amps: number;
  sentAtMs: number;
}

/**
 * A JSON-lines meter on a socat pseudo-terminal under /tmp, driven by the test: it sends
 * one frame every `periodMs` on its own device clock (t in seconds since it began, so it
 * runs on while the server is away), and remembers everything it sent.
 */
export class JsonlMeter {
  readonly sent: SentFrame[] = [];
  private fd = -1;
  private timer: NodeJS.Timeout | null = null;
  private readonly startedAtMs = performance.now();
  private k = 0;

  private constructor(readonly pair: PtyPair, readonly periodMs: number) {}

  static async open(link: string, periodMs: number): Promise<JsonlMeter> {
    const meter = new JsonlMeter(await openPtyPair(link), periodMs);
    meter.fd = openSync(meter.pair.devicePath, 'w');
    return meter;
  }

  /** Starts (or resumes) sending. */
  play(): void {
    this.timer ??= setInterval(() => this.tick(), this.periodMs);
  }

  /** Stops sending at once (the device clock keeps running). */
  pause(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /** Sends one line as it is (for values no meter would send). */
  sendRaw(line: string): void {
    writeSync(this.fd, line + '\n');
  }

  /** Seconds on the meter's clock now. */
  nowT(): number {
    return Math.round(performance.now() - this.startedAtMs) / 1000;
  }

  async close(): Promise<void> {
    this.pause();
    if (this.fd >= 0) closeSync(this.fd);
    this.fd = -1;
    await this.pair.close();
  }

  private tick(): void {
    const k = this.k++;
    // A 12.8 V pack discharged at about 10 A with a little ripple: values exact in JSON.
    const frame = { t: this.nowT(), volts: Math.round((13.3 - k * 1e-4) * 1e4) / 1e4, amps: 10 + (k % 5) * 0.25 };
    writeSync(this.fd, JSON.stringify(frame) + '\n');
    this.sent.push({ ...frame, sentAtMs: performance.now() });
  }
}

/** The exported readings of a run, by column. */
export interface ExportedRun {
  t: number[];
  volts: number[];
  amps: number[];
  dischargeWh: number[];
  dischargeAh: number[];
}

/** Picks the columns the checks need out of `GET /api/runs/:id/export.json`. */
export function exportColumns(body: { columns: string[]; rows: (number | null)[][] }): ExportedRun {
  const col = (name: string) => {
    const i = body.columns.indexOf(name);
    if (i < 0) throw new Error(`export has no ${name} column`);
    return body.rows.map((r) => r[i] as number);
  };
  return { t: col('t'), volts: col('volts'), amps: col('amps'), dischargeWh: col('dischargeWh'), dischargeAh: col('dischargeAh') };
}

/**
 * Wh and Ah of a discharge by the trapezoidal rule over the exported readings, computed
 * with ml-spectra-processing's xyIntegration (npm reference library, plain trapezoid) on
 * each stretch between gaps longer than `maxGapSeconds` (no integration across a gap:
 * the product's rule, common practice for logged data).
 */
export function referenceTotals(run: ExportedRun, maxGapSeconds: number): { wh: number; ah: number } {
  let ws = 0;
  let as = 0;
  let from = 0;
  for (let i = 1; i <= run.t.length; i++) {
    if (i < run.t.length && run.t[i]! - run.t[i - 1]! <= maxGapSeconds) continue;
    if (i - from >= 2) {
      const x = run.t.slice(from, i);
      ws += xyIntegration({ x, y: x.map((_, j) => run.volts[from + j]! * run.amps[from + j]!) });
      as += xyIntegration({ x, y: run.amps.slice(from, i) });
    }
    from = i;
  }
  return { wh: ws / SECONDS_PER_HOUR, ah: as / SECONDS_PER_HOUR };
}

/** Frames the meter sent that the export lacks (matched on the meter's t, to the microsecond). */
export function missingFrames(sent: readonly SentFrame[], run: ExportedRun): SentFrame[] {
  const MICRO = 1e6;
  const have = new Set(run.t.map((t) => Math.round(t * MICRO)));
  return sent.filter((f) => !have.has(Math.round(f.t * MICRO)));
}

/** True when every value is at least the one before it. */
export function neverDecreases(values: readonly number[]): boolean {
  return values.every((v, i) => i === 0 || v >= values[i - 1]!);
}
