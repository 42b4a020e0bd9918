/**
 * Gateways benchmark (issue 16): 200 simulated benches at 10 Hz on 4 bench gateways (50 each,
 * each gateway its own process running the production GatewayRuntime), through a private
 * Mosquitto into one server that records a run on every bench, with one WebSocket viewer
 * subscribed to all 200 benches (its own process). Measures frame-to-viewer delay (from the
 * moment the simulated meter made the frame), whether anything was lost, and the server
 * process's CPU and RSS. Soak length: GATEWAYS_SOAK_S (default 60 s).
 */
import { fork, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { join } from 'node:path';
import { hashPassword } from '../server/auth/password.js';
import { attachBenchManager } from '../server/compose/bench-root.js';
import { benchModel } from '../server/benches/bench-model.js';
import { BATTERY_OPTIONAL_DEFAULTS } from '../server/db/models/battery.js';
import { liveAttachment } from '../server/live/attach-live.js';
import { mqttAttachment } from '../server/mqtt/attach-mqtt.js';
import { startServer } from '../server/server.js';
import { startTestBroker } from '../tests/integration/gateway-kit.js';
import { testConfig } from '../tests/integration/helpers/test-config.js';
import { openBenchDb } from './bench-db.js';
import { DelayHistogram, wallMs } from './delay-histogram.js';
import type { FromGateway, ToGateway } from './gateway-child.js';
import type { FromGatewayViewers, ToGatewayViewers } from './gateway-viewers.js';
import { MS_PER_S } from '../shared/units/time.js';

const GATEWAYS = 4;
const BENCHES_PER_GATEWAY = 50;
/** Simulated seconds per real second; the scenario samples once a simulated second, so this is the rate in Hz. */
const HZ = 10;
const SOAK_S = Number(process.env.GATEWAYS_SOAK_S ?? 60);
const WARMUP_S = Math.min(10, SOAK_S / 4);
const PASSWORD = 'bench-viewer-password';
const MEMORY_EVERY_MS = 5000;
const mb = (b: number) => +(b / 1e6).toFixed(1);
/** Linux counts a process's CPU time in clock ticks of 1/100 s (USER_HZ, common practice on x86-64). */
const CLOCK_TICKS_PER_S = 100;

/** The broker process's user + system CPU time so far, in clock ticks (from /proc). */
function brokerCpuTicks(pid: number | undefined): number {
  if (pid === undefined) return 0;
  // Fields after the command name: state is field 3, utime 14 and stime 15 (proc(5)).
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  return Number(fields[11]) + Number(fields[12]);
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

function waitFor<T extends { type: string }>(child: ChildProcess, type: T['type']): Promise<T> {
  return new Promise((resolve) => {
    const on = (m: T) => m.type === type && (child.off('message', on), resolve(m));
    child.on('message', on);
  });
}

/** Prints and returns the gateway figures. */
export async function run(): Promise<Record<string, string | number>> {
  const db = await openBenchDb('gateways');
  const broker = await startTestBroker();
  const server = await startServer({
    config: testConfig(db.mariadb, { dataDir: mkdtempSync(join(tmpdir(), 'kp-gw-bench-')) }),
    database: db.mariadb,
    port: 0,
    attachments: [mqttAttachment({ broker }), attachBenchManager, liveAttachment()],
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  });
  const children: ChildProcess[] = [];
  try {
    const { User, Battery } = server.ctx.models;
    await User.create({ email: 'viewer@bench.lab', name: 'Bench Viewer', role: 'viewer', passwordHash: await hashPassword(PASSWORD) });
    const battery = await Battery.create({ ...BATTERY_OPTIONAL_DEFAULTS, label: 'Gateway pack', brand: 'Kestrel Energy', chemistry: 'lfp', cellsInSeries: 4, cellsInParallel: 1, ratedAh: 100, createdById: null });
    const service = server.ctx.services.gateways!;
    const recorder = server.ctx.services.runRecorder!;
    let framesAtServer = 0;
    let measuring = false;
    // The same age measured where the server takes the frame: tells the gateway and broker's share from the hub and socket's.
    const epochs = new Map<number, number>();
    const toServer = new DelayHistogram();
    server.ctx.services.benchManager!.onFrame((benchId, frame) => {
      framesAtServer++;
      const epoch = epochs.get(benchId);
      if (measuring && epoch !== undefined) toServer.add(wallMs() - (epoch + (frame.t * MS_PER_S) / HZ));
    });
    const gateways: { name: string; password: string; benchIds: number[] }[] = [];
    const allBenchIds: number[] = [];
    for (let g = 0; g < GATEWAYS; g++) {
      const { gateway, password } = await service.create(`room-${g + 1}`);
      const benchIds: number[] = [];
      for (let i = 0; i < BENCHES_PER_GATEWAY; i++) {
        const source = { kind: 'simulator', scenario: 'lfp-12v-100ah-cp-cutoff', speed: HZ, seed: allBenchIds.length + 1, staleAfterSeconds: 10 };
        const row = await benchModel(server.ctx.sequelize).create({ name: `Room ${g + 1} bench ${i + 1}`, source: JSON.stringify(source), enabled: true, notes: '' });
        benchIds.push(row.id);
        allBenchIds.push(row.id);
      }
      await service.assign(gateway.id, benchIds);
      gateways.push({ name: gateway.name, password, benchIds });
    }
    for (const benchId of allBenchIds) {
      await recorder.start(
        { benchId, batteryId: battery.id, name: `Bench ${benchId}`, tags: [], kind: 'capacity-discharge', endVolts: null, acceptancePercent: 100, alarms: { onCutoff: true }, stopWhen: 'manual', tempProtections: [], protectionChecks: [], targetAh: null, targetWh: null, afterRecoverySeconds: 0 },
        null,
      );
    }
    const viewers = fork(new URL('./gateway-viewers.ts', import.meta.url), [], { execArgv: ['--import', 'tsx'], stdio: 'inherit' });
    children.push(viewers);
    const tellViewers = (m: ToGatewayViewers) => viewers.send(m);
    const ready = waitFor<FromGatewayViewers>(viewers, 'ready');
    tellViewers({ type: 'start', url: server.url, cookie: await signIn(server.url, 'viewer@bench.lab'), benchIds: allBenchIds, speed: HZ });
    await ready;
    const outbox = new Map<string, { framesMade: number; outboxDepth: number }>();
    for (const g of gateways) {
      const child = fork(new URL('./gateway-child.ts', import.meta.url), [], { execArgv: ['--import', 'tsx'], stdio: 'inherit' });
      children.push(child);
      child.on('message', (m: FromGateway) => {
        if (m.type === 'epoch') {
          epochs.set(m.benchId, m.atMs);
          tellViewers({ type: 'epoch', benchId: m.benchId, atMs: m.atMs });
        }
        else outbox.set(g.name, { framesMade: m.framesMade, outboxDepth: m.outboxDepth });
      });
      child.send({ type: 'start', brokerUrl: broker.url, name: g.name, password: g.password, dir: mkdtempSync(join(tmpdir(), `kp-gw-${g.name}-`)) } satisfies ToGateway);
    }
    await new Promise((r) => setTimeout(r, WARMUP_S * MS_PER_S));
    tellViewers({ type: 'measure', on: true });
    measuring = true;
    // How long the server's event loop was blocked: separates its own stalls from waiting for a core.
    const loopDelay = monitorEventLoopDelay({ resolution: 10 });
    loopDelay.enable();
    const cpu0 = process.cpuUsage();
    const brokerTicks0 = brokerCpuTicks(broker.pid);
    const t0 = Date.now();
    const rss: number[] = [mb(process.memoryUsage().rss)];
    let maxOutbox = 0;
    const sampler = setInterval(() => {
      rss.push(mb(process.memoryUsage().rss));
      maxOutbox = Math.max(maxOutbox, ...[...outbox.values()].map((o) => o.outboxDepth));
    }, MEMORY_EVERY_MS);
    await new Promise((r) => setTimeout(r, (SOAK_S - WARMUP_S) * MS_PER_S));
    clearInterval(sampler);
    const cpu = process.cpuUsage(cpu0);
    loopDelay.disable();
    const brokerTicks = brokerCpuTicks(broker.pid) - brokerTicks0;
    const wallS = (Date.now() - t0) / MS_PER_S;
    const load = loadavg();
    rss.push(mb(process.memoryUsage().rss));
    tellViewers({ type: 'measure', on: false });
    measuring = false;
    // Stop the gateways: their sources stop, their outboxes drain, they say how many frames they made.
    const stopped = gateways.map((_, i) => waitFor<Extract<FromGateway, { type: 'stopped' }>>(children[i + 1]!, 'stopped'));
    for (let i = 0; i < gateways.length; i++) children[i + 1]!.send({ type: 'stop' } satisfies ToGateway);
    const finals = await Promise.all(stopped);
    const framesMade = finals.reduce((n, f) => n + f.framesMade, 0);
    const until = Date.now() + 30_000;
    while (framesAtServer < framesMade && Date.now() < until) await new Promise((r) => setTimeout(r, 100));
    const report = waitFor<Extract<FromGatewayViewers, { type: 'report' }>>(viewers, 'report');
    tellViewers({ type: 'report' });
    const v = await report;
    const link = server.ctx.services.gatewayLink!;
    const figures = {
      gateways: GATEWAYS,
      benches: allBenchIds.length,
      hz: HZ,
      soakSeconds: SOAK_S,
      framesMade,
      framesAtServer,
      lost: framesMade - framesAtServer,
      duplicatesDropped: link.counters.duplicates,
      sequenceGaps: link.counters.gaps,
      outboxLeft: finals.reduce((n, f) => n + f.outboxDepth, 0),
      outboxMaxDepth: maxOutbox,
      viewerReadings: v.received,
      viewerThinned: v.dropped,
      frameToServerP50Ms: +toServer.quantile(0.5).toFixed(1),
      frameToServerP99Ms: +toServer.quantile(0.99).toFixed(1),
      frameToViewerP50Ms: +v.p50Ms.toFixed(1),
      frameToViewerP99Ms: +v.p99Ms.toFixed(1),
      frameToViewerMaxMs: +v.maxMs.toFixed(1),
      serverCpuPercentOfOneCore: +(((cpu.user + cpu.system) / 1000 / (wallS * MS_PER_S)) * 100).toFixed(1),
      serverEventLoopDelayP99Ms: +(loopDelay.percentile(99) / 1e6).toFixed(1),
      serverEventLoopDelayMaxMs: +(loopDelay.max / 1e6).toFixed(1),
      serverHeapEndMB: mb(process.memoryUsage().heapUsed),
      gatewayCpuPercentOfOneCoreEach: finals.map((f) => f.cpuPercentOfOneCore).join(' / '),
      brokerCpuPercentOfOneCore: +(((brokerTicks / CLOCK_TICKS_PER_S) / wallS) * 100).toFixed(1),
      serverRssStartMB: rss[0]!,
      serverRssEndMB: rss[rss.length - 1]!,
      serverRssMaxMB: Math.max(...rss),
      loadAvg1m: +load[0]!.toFixed(2),
      loadAvg5m: +load[1]!.toFixed(2),
    };
    console.log(figures);
    return figures;
  } finally {
    for (const c of children) if (c.connected) c.kill();
    await server.close();
    await broker.stop();
    await db.close();
  }
}
