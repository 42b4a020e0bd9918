/**
 * Live benchmark (issue 5): 20 benches at 10 Hz, each recording a run (so the recorder and
 * the archive work too), and 50 WebSocket viewers each subscribed to all 20 benches.
 * Measures frame-in (handed to the hub) → frame-out (parsed by a viewer) delay and server
 * memory over a soak. Everything runs in one process, so the viewers' own parsing shares
 * the CPU with the server: the figures are pessimistic.
 * Soak length: LIVE_SOAK_S (default 60 s; the issue's full soak is 1800).
 */
import { performance } from 'node:perf_hooks';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import WebSocket from 'ws';
import type { BenchStatus } from '../shared/schemas/bench.js';
import type { Frame } from '../shared/schemas/frame.js';
import type { ServerMessage } from '../shared/schemas/ws.js';
import { hashPassword } from '../server/auth/password.js';
import { BATTERY_OPTIONAL_DEFAULTS } from '../server/db/models/battery.js';
import { liveAttachment } from '../server/live/attach-live.js';
import { benchModel } from '../server/benches/bench-model.js';
import { startServer } from '../server/server.js';
import { testConfig } from '../tests/integration/helpers/test-config.js';
import { openBenchDb } from './bench-db.js';

const BENCHES = 20;
const HZ = 10;
const VIEWERS = 50;
const SOAK_S = Number(process.env.LIVE_SOAK_S ?? 60);
const WARMUP_S = Math.min(10, SOAK_S / 4);
const MEMORY_EVERY_MS = 5000;
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

/** Delays go into a fixed histogram (0.1 ms steps up to 10 s), so a long soak measures without growing. */
const HIST_STEP_MS = 0.1;
const HIST_SLOTS = 100_000;
class Histogram {
  private readonly counts = new Uint32Array(HIST_SLOTS + 1);
  n = 0;
  max = 0;
  add(ms: number): void {
    this.counts[Math.min(HIST_SLOTS, Math.floor(ms / HIST_STEP_MS))]!++;
    this.n++;
    if (ms > this.max) this.max = ms;
  }
  /** Upper edge of the slot holding the p-quantile. */
  quantile(p: number): number {
    const want = Math.ceil(this.n * p);
    let seen = 0;
    for (let i = 0; i <= HIST_SLOTS; i++) {
      seen += this.counts[i]!;
      if (seen >= want) return (i + 1) * HIST_STEP_MS;
    }
    return Number.NaN;
  }
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
  const sockets: WebSocket[] = [];
  const timers: NodeJS.Timeout[] = [];
  try {
    const { User, Battery } = server.ctx.models;
    await User.create({ email: 'viewer@bench.lab', name: 'Bench Viewer', role: 'viewer', passwordHash: await hashPassword(PASSWORD) });
    const battery = await Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: 'Soak pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, createdById: null });
    const recorder = server.ctx.services.runRecorder!;
    for (let b = 1; b <= BENCHES; b++) {
      await benchModel(server.ctx.sequelize).create({ id: b, name: `Soak bench ${b}`, source: JSON.stringify({ kind: 'none' }), enabled: true, notes: '' });
      await recorder.start(
        { benchId: b, batteryId: battery.id, name: `Soak ${b}`, tags: [], kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual', tempProtections: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
        null,
      );
    }
    const sentAt = new Map<string, number>();
    const delays = new Histogram();
    let measuring = false;
    let received = 0;
    const cookie = await signIn(server.url, 'viewer@bench.lab');
    for (let v = 0; v < VIEWERS; v++) {
      const ws = new WebSocket(server.url.replace('http', 'ws') + '/ws', { headers: { cookie, origin: server.url } });
      await new Promise((resolve, reject) => (ws.once('open', resolve), ws.once('error', reject)));
      ws.on('message', (data) => {
        const now = performance.now();
        const m = JSON.parse(String(data)) as ServerMessage;
        if (m.type !== 'batch') return;
        for (const t of m.readings.t) {
          received++;
          const at = sentAt.get(`${m.topic.id}:${t}`);
          if (measuring && at !== undefined) delays.add(now - at);
        }
      });
      for (let b = 1; b <= BENCHES; b++) ws.send(JSON.stringify({ type: 'subscribe', topic: { kind: 'bench', id: b } }));
      sockets.push(ws);
    }
    let seq = 0;
    for (let b = 1; b <= BENCHES; b++) {
      // Benches start staggered across one period, as real meters would.
      await new Promise((r) => setTimeout(r, 1000 / HZ / BENCHES));
      let n = 0;
      timers.push(
        setInterval(() => {
          const t = n++;
          sentAt.set(`${b}:${t}`, performance.now());
          seq++;
          feed.emit(b, { t, volts: 13.2 - t * 1e-5, amps: 20 + (t % 10) * 0.01, temps: { cell: 25 }, clock: 'device' });
        }, 1000 / HZ),
      );
    }
    // Forget send times older than a few seconds, so the benchmark itself stays flat.
    timers.push(setInterval(() => {
      const cutoff = performance.now() - 5000;
      for (const [k, at] of sentAt) if (at < cutoff) sentAt.delete(k);
    }, 1000));
    await new Promise((r) => setTimeout(r, WARMUP_S * 1000));
    measuring = true;
    const memory: { heap: number; rss: number }[] = [];
    const sample = () => {
      const m = process.memoryUsage();
      memory.push({ heap: m.heapUsed, rss: m.rss });
    };
    sample();
    timers.push(setInterval(sample, MEMORY_EVERY_MS));
    await new Promise((r) => setTimeout(r, (SOAK_S - WARMUP_S) * 1000));
    sample();
    measuring = false;
    const first = memory[0]!;
    const last = memory[memory.length - 1]!;
    const figures = {
      benches: BENCHES,
      hz: HZ,
      viewers: VIEWERS,
      soakS: SOAK_S,
      framesIn: seq,
      readingsOut: received,
      delayP50Ms: +delays.quantile(0.5).toFixed(1),
      delayP99Ms: +delays.quantile(0.99).toFixed(1),
      delayMaxMs: +delays.max.toFixed(1),
      heapStartMB: mb(first.heap),
      heapEndMB: mb(last.heap),
      heapMaxMB: mb(Math.max(...memory.map((m) => m.heap))),
      rssStartMB: mb(first.rss),
      rssEndMB: mb(last.rss),
      archivedReadings: Number(((await server.ctx.sequelize.query('SELECT SUM(count) AS n FROM run_sample_chunks', { plain: true })) as { n: number } | null)?.n ?? 0),
    };
    console.log(figures);
    return figures;
  } finally {
    for (const t of timers) clearInterval(t);
    for (const s of sockets) s.terminate();
    await server.close();
    await db.close();
  }
}
