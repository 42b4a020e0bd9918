/**
 * Alarms benchmark (issue 12): 20 benches at 10 Hz, each recording a run, 10 people each
 * subscribed by e-mail to a cutoff on every bench, and 10 WebSocket viewers watching all 20
 * benches. All 20 packs reach the end voltage at the same moment: 20 cutoffs × 10 people =
 * 200 alarm e-mails through the production path (run pipeline → alarm service → delivery
 * queue in MariaDB → e-mail channel → nodemailer → the local fake SMTP server → outbox).
 * Measures the time from that moment to the 200th message stored by the fake SMTP server,
 * and the live stream's frame-in → viewer delay over the same window.
 * Set KNEEPOINT_BENCH_DB_PORT to a free port for the benchmark's MariaDB.
 */
import { fork } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { BenchStatus } from '../shared/schemas/bench.js';
import type { Frame } from '../shared/schemas/frame.js';
import { DEFAULT_ALARM_DELIVERY, attachAlarms } from '../server/compose/alarms-root.js';
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
const SUBSCRIBERS = 10;
const VIEWERS = 10;
const WARMUP_S = 8;
/** How long after the cutoffs the stream is still measured, and the longest wait for the mail. */
const WATCH_S = 15;
const END_VOLTS = 10;
const PASSWORD = 'bench-viewer-password';
const POLL_MS = 20;

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

/** Prints and returns the alarm delivery figures. */
export async function run(): Promise<Record<string, string | number>> {
  const db = await openBenchDb('alarms');
  const feed = new Feed();
  const server = await startServer({
    config: testConfig(db.mariadb, {
      dataDir: mkdtempSync(join(tmpdir(), 'kp-alarms-bench-')),
      alarms: { ...DEFAULT_ALARM_DELIVERY, mailFrom: 'alarms@northgate-cell-lab.test' },
    }),
    database: db.mariadb,
    port: 0,
    attachments: [liveAttachment({ feed }), attachAlarms],
    log: { info: () => {}, warn: (m) => console.warn(m), error: (m, e) => console.error(m, e) },
  });
  const viewers = fork(new URL('./live-viewers.ts', import.meta.url), [], { execArgv: ['--import', 'tsx'], stdio: 'inherit' });
  const fromViewers = (type: FromViewers['type']) =>
    new Promise<FromViewers>((resolve) => {
      const on = (m: FromViewers) => m.type === type && (viewers.off('message', on), resolve(m));
      viewers.on('message', on);
    });
  const tell = (m: ToViewers) => viewers.send(m);
  const timers: NodeJS.Timeout[] = [];
  try {
    const { User, Battery } = server.ctx.models;
    const passwordHash = await hashPassword(PASSWORD);
    await User.create({ email: 'viewer@bench.lab', name: 'Bench Viewer', role: 'viewer', passwordHash });
    for (let s = 1; s <= SUBSCRIBERS; s++) {
      const user = await User.create({ email: `tech${s}@bench.lab`, name: `Bench Technician ${s}`, role: 'technician', passwordHash });
      await server.ctx.sequelize.query("INSERT INTO alarm_subscriptions (userId, benchId, kind, channel) VALUES (?, NULL, 'cutoff', 'email')", { replacements: [user.id] });
    }
    const battery = await Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: 'Alarm pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, createdById: null });
    const recorder = server.ctx.services.runRecorder!;
    for (let b = 1; b <= BENCHES; b++) {
      await benchModel(server.ctx.sequelize).create({ id: b, name: `Alarm bench ${b}`, source: JSON.stringify({ kind: 'none' }), enabled: true, notes: '' });
      await recorder.start(
        { benchId: b, batteryId: battery.id, name: `Alarm run ${b}`, tags: [], kind: 'capacity-discharge', endVolts: { mode: 'absolute', volts: END_VOLTS }, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual', tempProtections: [], protectionChecks: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
        null,
      );
    }
    const epochMs = wallMs();
    const cookie = await signIn(server.url, 'viewer@bench.lab');
    const ready = fromViewers('ready');
    tell({ type: 'start', url: server.url, cookie, viewers: VIEWERS, benches: BENCHES, epochMs });
    await ready;
    // Every pack above the end voltage until `cutAtMs`, then all below it at once.
    let cutAtMs = Number.POSITIVE_INFINITY;
    for (let b = 1; b <= BENCHES; b++) {
      await new Promise((r) => setTimeout(r, 1000 / HZ / BENCHES));
      let n = 0;
      timers.push(setInterval(() => {
        const k = n++;
        const volts = wallMs() >= cutAtMs ? END_VOLTS - 0.5 : 13.2 - k * 1e-5;
        feed.emit(b, { t: (wallMs() - epochMs) / 1000, volts, amps: 20, temps: { cell: 25 }, clock: 'device' });
      }, 1000 / HZ));
    }
    await new Promise((r) => setTimeout(r, WARMUP_S * 1000));
    tell({ type: 'measure', on: true });
    cutAtMs = wallMs();
    const expected = BENCHES * SUBSCRIBERS;
    let mails = 0;
    let allMailMs: number | null = null;
    while (wallMs() - cutAtMs < WATCH_S * 1000) {
      await new Promise((r) => setTimeout(r, POLL_MS));
      if (allMailMs === null) {
        const row = (await server.ctx.sequelize.query('SELECT COUNT(*) AS n FROM mail_outbox', { plain: true })) as { n: number | bigint } | null;
        mails = Number(row?.n ?? 0);
        if (mails >= expected) allMailMs = wallMs() - cutAtMs;
      }
    }
    tell({ type: 'measure', on: false });
    for (const t of timers.splice(0)) clearInterval(t);
    const report = fromViewers('report');
    tell({ type: 'report' });
    const v = (await report) as Extract<FromViewers, { type: 'report' }>;
    const [alarmRows] = await server.ctx.sequelize.query("SELECT COUNT(*) AS n FROM alarms WHERE kind = 'cutoff'");
    const figures = {
      benches: BENCHES,
      hz: HZ,
      subscribers: SUBSCRIBERS,
      viewers: VIEWERS,
      cutoffAlarms: Number((alarmRows as { n: number }[])[0]?.n ?? 0),
      mailsExpected: expected,
      mailsReceived: mails,
      allMailWithinMs: allMailMs === null ? `not within ${WATCH_S} s` : Math.round(allMailMs),
      streamReadings: v.received,
      streamDelayP50Ms: +v.p50Ms.toFixed(1),
      streamDelayP99Ms: +v.p99Ms.toFixed(1),
      streamDelayMaxMs: +v.maxMs.toFixed(1),
    };
    console.log(figures);
    return figures;
  } finally {
    for (const t of timers) clearInterval(t);
    if (viewers.connected) viewers.kill();
    await server.close();
    await db.close();
  }
}
