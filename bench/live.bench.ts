/**
 * Live benchmark (issue 5): 20 benches at 10 Hz, each recording a run (so the recorder and
 * the archive work too), and 50 WebSocket viewers each subscribed to all 20 benches.
 * Measures frame-in (handed to the hub) → frame-out (parsed by a viewer) delay and server
 * memory over a soak. The viewers run in a child process (bench/live-viewers.ts), so the
 * memory figures are the server process's alone; they still share the machine's 2 cores.
 * Soak length: LIVE_SOAK_S (default 60 s; the full soak is 1800). Run node with
 * --expose-gc to sample memory after a full collection.
 */
import { fork } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BenchStatus } from '../shared/schemas/bench.js';
import type { Frame } from '../shared/schemas/frame.js';
import { hashPassword } from '../server/auth/password.js';
import { BATTERY_OPTIONAL_DEFAULTS } from '../server/db/models/battery.js';
import { liveAttachment } from '../server/live/attach-live.js';
import { benchModel } from '../server/benches/bench-model.js';
import { startServer } from '../server/server.js';
import { testConfig } from '../tests/integration/helpers/test-config.js';
import { openBenchDb } from './bench-db.js';
import { wallMs } from './delay-histogram.js';
import type { FromViewers, ToViewers } from './live-viewers.js';

const BENCHES = 20;
const HZ = 10;
const VIEWERS = 50;
const SOAK_S = Number(process.env.LIVE_SOAK_S ?? 60);
const WARMUP_S = Math.min(10, SOAK_S / 4);
/** Memory samples: often enough to see a plateau or a slope in a short soak. */
const MEMORY_EVERY_MS = Number(process.env.LIVE_MEMORY_EVERY_S ?? 30) * 1000;
const PASSWORD = 'bench-viewer-password';

class Feed {
  private frames = new Set<(benchId: number, frame: Frame) => void>();
  onFrame(l: (benchId: number, frame: Frame) => void) {
    this.frames.add(l);
    return () => void this.frames.delete(l);
  }
  onStatus(_l: (benchId: number, status: BenchStatus) => void) {
    return () => undefined;
  }
  emit(benchId: number, frame: Frame) {
    for (const l of this.frames) l(benchId, frame);
  }
}

async function signIn(url: string, email: string): Promise<string> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const first = csrf.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: first },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (login.status !== 200) throw new Error(`login ${login.status}`);
  return login.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

const mb = (b: number) => +(b / 1e6).toFixed(1);

/** Prints and returns the live figures. */
export async function run(): Promise<Record<string, string | number>> {
  const db = await openBenchDb('live');
  const feed = new Feed();
  const server = await startServer({
    config: testConfig(db.mariadb, { dataDir: mkdtempSync(join(tmpdir(), 'kp-live-bench-')) }),
    database: db.mariadb,
    port: 0,
    attachments: [liveAttachment({ feed })],
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  });
  const viewers = fork(new URL('./live-viewers.ts', import.meta.url), [], { execArgv: ['--import', 'tsx'], stdio: 'inherit' });
  const fromViewers = (type: FromViewers['type']) =>
    new Promise<FromViewers>((resolve) => {
      const on = (m: FromViewers) => m.type === type && (viewers.off('message', on), resolve(m));
      viewers.on('message', on);
    });
  const tell = (m: ToViewers) => viewers.send(m);
  const timers: NodeJS.Timeout[] = [];
  let closed = false;
  try {
    const { User, Battery } = server.ctx.models;
    await User.create({ email: 'viewer@bench.lab', name: 'Bench Viewer', role: 'viewer', passwordHash: await hashPassword(PASSWORD) });
    const battery = await Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: 'Soak pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, createdById: null });
    const recorder = server.ctx.services.runRecorder!;
    for (let b = 1; b <= BENCHES; b++) {
      await benchModel(server.ctx.sequelize).create({ id: b, name: `Soak bench ${b}`, source: JSON.stringify({ kind: 'none' }), enabled: true, notes: '' });
      await recorder.start(
        { benchId: b, batteryId: battery.id, name: `Soak ${b}`, tags: [], kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual', tempProtections: [], protectionChecks: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
        null,
      );
    }
    // Frame times are wall-clock seconds since this epoch, so the viewers' process can tell each frame's delay.
    const epochMs = wallMs();
    const cookie = await signIn(server.url, 'viewer@bench.lab');
    const ready = fromViewers('ready');
    tell({ type: 'start', url: server.url, cookie, viewers: VIEWERS, benches: BENCHES, epochMs });
    await ready;
    let seq = 0;
    for (let b = 1; b <= BENCHES; b++) {
      // Benches start staggered across one period, as real meters would.
      await new Promise((r) => setTimeout(r, 1000 / HZ / BENCHES));
      let n = 0;
      timers.push(
        setInterval(() => {
          const k = n++;
          seq++;
          feed.emit(b, { t: (wallMs() - epochMs) / 1000, volts: 13.2 - k * 1e-5, amps: 20 + (k % 10) * 0.01, temps: { cell: 25 }, clock: 'device' });
        }, 1000 / HZ),
      );
    }
    await new Promise((r) => setTimeout(r, WARMUP_S * 1000));
    tell({ type: 'measure', on: true });
    const memory: { s: number; rss: number; heap: number; external: number; arrayBuffers: number }[] = [];
    const t0 = Date.now();
    const sample = () => {
      (globalThis as { gc?: () => void }).gc?.();
      const m = process.memoryUsage();
      memory.push({ s: Math.round((Date.now() - t0) / 1000), rss: mb(m.rss), heap: mb(m.heapUsed), external: mb(m.external), arrayBuffers: mb(m.arrayBuffers) });
      console.log('memory', JSON.stringify(memory[memory.length - 1]));
    };
    sample();
    timers.push(setInterval(sample, MEMORY_EVERY_MS));
    await new Promise((r) => setTimeout(r, (SOAK_S - WARMUP_S) * 1000));
    sample();
    tell({ type: 'measure', on: false });
    for (const t of timers.splice(0)) clearInterval(t);
    const report = fromViewers('report');
    tell({ type: 'report' });
    const v = (await report) as Extract<FromViewers, { type: 'report' }>;
    // A clean shutdown hands every pending reading to the archive and waits for it to be
    // written; only then is the count comparable with the frames sent.
    closed = true;
    await server.close();
    const archivedReadings = Number(((await db.sequelize.query('SELECT SUM(count) AS n FROM run_reading_chunks', { plain: true })) as { n: number } | null)?.n ?? 0);
    const first = memory[0]!;
    const last = memory[memory.length - 1]!;
    const figures = {
      benches: BENCHES,
      hz: HZ,
      viewers: VIEWERS,
      soakSeconds: SOAK_S,
      framesIn: seq,
      readingsOut: v.received,
      delayP50Ms: +v.p50Ms.toFixed(1),
      delayP99Ms: +v.p99Ms.toFixed(1),
      delayMaxMs: +v.maxMs.toFixed(1),
      heapStartMB: first.heap,
      heapEndMB: last.heap,
      heapMaxMB: Math.max(...memory.map((m) => m.heap)),
      rssStartMB: first.rss,
      rssEndMB: last.rss,
      rssMaxMB: Math.max(...memory.map((m) => m.rss)),
      externalStartMB: first.external,
      externalEndMB: last.external,
      viewersRssStartMB: v.rssStartMB,
      viewersRssEndMB: v.rssMB,
      archivedReadings,
    };
    console.log(figures);
    return figures;
  } finally {
    for (const t of timers) clearInterval(t);
    if (viewers.connected) viewers.kill();
    if (!closed) await server.close();
    await db.close();
  }
}
