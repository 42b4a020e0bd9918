/**
 * Journal benchmark (issue 8, durability): what the readings journal costs on the
 * production path. Frames go through a frame feed into the real RunRecorder (20 runs),
 * whose readings go to the real archive writer in a private MariaDB (port 3329) and, in
 * the second pass, also to the ReadingJournal wired exactly as server/live/attach-live.ts
 * wires it. Prints readings/s without and with the journal, then the journal's write +
 * fdatasync time per batch at a busy lab's rate (20 runs at 10 Hz, the production 50 ms
 * timer), and the age of a reading when it was written (safe from a crash of the process)
 * and when it was synced (safe from a power cut). Figures go to docs/reliability.md.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay, performance } from 'node:perf_hooks';
import type { Frame } from '../shared/schemas/frame.js';
import { createArchiveWriter } from '../server/archive/archive-service.js';
import { archiveSink } from '../server/archive/run-archive.js';
import { benchModel } from '../server/benches/bench-model.js';
import { BATTERY_OPTIONAL_DEFAULTS } from '../server/db/models/battery.js';
import { defineCoreModels } from '../server/db/models/index.js';
import { JOURNAL_SYNC_INTERVAL_MS, ReadingJournal } from '../server/journal/reading-journal.js';
import { RunRecorder, type FrameFeed } from '../server/runs/run-recorder.js';
import { RunsRepo } from '../server/runs/runs-repo.js';
import { openBenchDb } from './bench-db.js';
import { MS_PER_S } from '../shared/units/time.js';
import { quietLogger } from '../server/log/logger.js';

const RUNS = 20;
const FRAMES_PER_RUN = 25_000;
/** Frames pushed before yielding to the event loop (timers, database, disk get their turn). */
const FRAMES_PER_TURN = 2000;
const LAB_HZ = 10;
const LAB_SECONDS = Number(process.env.JOURNAL_BENCH_S ?? 20);
const NS_PER_MS = 1e6;

class BenchFeed implements FrameFeed {
  private listener: ((benchId: number, frame: Frame) => void) | null = null;
  onFrame(listener: (benchId: number, frame: Frame) => void) {
    this.listener = listener;
    return () => void (this.listener = null);
  }
  emit(benchId: number, frame: Frame): void {
    this.listener?.(benchId, frame);
  }
}

const frame = (i: number): Frame => ({ t: i / LAB_HZ, volts: 13.3 - i * 1e-6, amps: 10 + (i % 7) * 0.01, temps: { cell: 23.5 }, clock: 'device' });
const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;

/** One recorder with RUNS live runs, optionally with the journal as a sink beside the archive. */
async function setUp(name: string, withJournal: boolean, timer?: (fn: () => void, ms: number) => { unref?: () => void }) {
  const db = await openBenchDb(name);
  const models = defineCoreModels(db.sequelize);
  const battery = await models.Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: 'Bench pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, createdById: null });
  const journalDir = mkdtempSync(join(tmpdir(), 'kp-journal-bench-'));
  const journal = withJournal ? new ReadingJournal({ dir: journalDir, log: quietLogger, setInterval: timer }) : null;
  const writer = createArchiveWriter(db.sequelize, {
    spillDir: join(journalDir, 'spill'), log: quietLogger,
    onArchived: (b) => journal?.archived(b.runId, b.patch.readingsCount ?? 0, b.patch.endedAt !== undefined),
  });
  await writer.start();
  const repo = new RunsRepo(db.sequelize);
  const facts = { id: battery.id, label: 'Bench pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 100, ratedWh: null, price: null, massKg: null, protectionSpecs: [] };
  const recorder = new RunRecorder({ repo, archive: archiveSink(writer), getBattery: async () => facts, log: quietLogger });
  if (journal) recorder.readings.add((runId, reading, index) => journal.append(runId, index, reading));
  const feed = new BenchFeed();
  recorder.attach(feed);
  journal?.start();
  for (let b = 1; b <= RUNS; b++) {
    await benchModel(db.sequelize).create({ id: b, name: `Bench ${b}`, source: JSON.stringify({ kind: 'none' }), enabled: true, notes: '' });
    await recorder.start({ benchId: b, batteryId: battery.id, name: `Run ${b}`, tags: [], kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: false }, stopWhen: 'manual', tempProtections: [], protectionChecks: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 }, null);
  }
  return {
    feed, journal, writer,
    close: async () => {
      recorder.detach();
      await writer.shutdown(30_000);
      await journal?.close();
      await db.close();
      rmSync(journalDir, { recursive: true, force: true });
    },
  };
}

/** As fast as the recorder takes them: readings/s from the first frame to all of them on disk (journal) and handed to the archive. */
async function throughput(withJournal: boolean): Promise<number> {
  const s = await setUp(withJournal ? 'journal_on' : 'journal_off', withJournal);
  const start = performance.now();
  for (let i = 0; i < FRAMES_PER_RUN; i++) {
    for (let b = 1; b <= RUNS; b++) s.feed.emit(b, frame(i));
    if (i % (FRAMES_PER_TURN / RUNS) === 0) await new Promise((r) => setImmediate(r));
  }
  await s.journal?.flush();
  const seconds = (performance.now() - start) / MS_PER_S;
  await s.close();
  const perS = Math.round((RUNS * FRAMES_PER_RUN) / seconds);
  console.log(`${withJournal ? 'with' : 'without'} journal: ${perS.toLocaleString('en-GB')} readings/s (${RUNS} runs × ${FRAMES_PER_RUN.toLocaleString('en-GB')} readings)`);
  return perS;
}

/** A busy lab in real time: each batch's write + fdatasync, and the oldest reading's age when it was on disk. */
async function labLatency(): Promise<Record<string, number>> {
  const flushMs: number[] = [];
  const ageMs: number[] = [];
  const writtenAgeMs: number[] = [];
  let oldestPendingAt: number | null = null;
  let journal: ReadingJournal | null = null;
  const timer = (fn: () => void, ms: number) =>
    setInterval(() => {
      if (!journal) return fn(); // still setting up the runs: not measured
      const started = performance.now();
      const oldest = oldestPendingAt;
      oldestPendingAt = null;
      fn();
      void journal.flush().then(() => {
        const done = performance.now();
        flushMs.push(done - started);
        if (oldest === null) return;
        ageMs.push(done - oldest);
      });
    }, ms);
  const s = await setUp('journal_lab', true, timer);
  journal = s.journal;
  // How late this process's own event loop ran meanwhile: on a shared machine it bounds every figure below.
  const lag = monitorEventLoopDelay({ resolution: 10 });
  lag.enable();
  let i = 0;
  await new Promise<void>((done) => {
    const tick = setInterval(() => {
      const at = performance.now();
      oldestPendingAt ??= at;
      for (let b = 1; b <= RUNS; b++) s.feed.emit(b, frame(i));
      // The journal queued its write in a setImmediate of its own, before this one.
      setImmediate(() => void s.journal!.settled().then(() => writtenAgeMs.push(performance.now() - at)));
      if (++i >= LAB_SECONDS * LAB_HZ) {
        clearInterval(tick);
        done();
      }
    }, MS_PER_S / LAB_HZ);
  });
  lag.disable();
  await s.close();
  flushMs.sort((a, b) => a - b);
  ageMs.sort((a, b) => a - b);
  writtenAgeMs.sort((a, b) => a - b);
  const round = (x: number) => Math.round(x * 100) / 100;
  const out = {
    labBatchSyncP50Ms: round(percentile(flushMs, 0.5)), labBatchSyncP99Ms: round(percentile(flushMs, 0.99)), labBatchSyncMaxMs: round(flushMs[flushMs.length - 1]!),
    labReadingAgeP99Ms: round(percentile(ageMs, 0.99)), labReadingAgeMaxMs: round(ageMs[ageMs.length - 1]!),
    labWrittenAgeP99Ms: round(percentile(writtenAgeMs, 0.99)), labWrittenAgeMaxMs: round(writtenAgeMs[writtenAgeMs.length - 1]!),
    labEventLoopLagP99Ms: round(lag.percentile(99) / NS_PER_MS), labEventLoopLagMaxMs: round(lag.max / NS_PER_MS),
  };
  console.log(`${RUNS} runs at ${LAB_HZ} Hz for ${LAB_SECONDS} s, batches every ${JOURNAL_SYNC_INTERVAL_MS} ms: write + fdatasync p50 ${out.labBatchSyncP50Ms} ms, p99 ${out.labBatchSyncP99Ms} ms, max ${out.labBatchSyncMaxMs} ms; a reading's age when written p99 ${out.labWrittenAgeP99Ms} ms, max ${out.labWrittenAgeMaxMs} ms; when synced p99 ${out.labReadingAgeP99Ms} ms, max ${out.labReadingAgeMaxMs} ms; this process's event-loop lag p99 ${out.labEventLoopLagP99Ms} ms, max ${out.labEventLoopLagMaxMs} ms`);
  return out;
}

/** Runs the journal benchmark and returns its figures. */
export async function run(): Promise<Record<string, string | number>> {
  const without = await throughput(false);
  const withJournal = await throughput(true);
  const lab = await labLatency();
  return { readingsPerSWithoutJournal: without, readingsPerSWithJournal: withJournal, journalCostPercent: Math.round((1 - withJournal / without) * 1000) / 10, ...lab };
}
