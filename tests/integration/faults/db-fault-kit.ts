/**
 * Helpers for the database fault tests: a real Kneepoint server process that provisions and
 * supervises its own private MariaDB, a meter writing CSV frames into a pseudo-terminal, a
 * signed-in HTTP client and a WebSocket viewer. Everything runs for real; nothing is mocked.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { appendFileSync, closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeFileSync, writeSync } from 'node:fs';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import WebSocket from 'ws';
import { xyIntegration } from 'ml-spectra-processing';
import { hashPassword } from '../../../server/auth/password.js';
import { defineCoreModels } from '../../../server/db/models/index.js';
import { createSequelize } from '../../../server/db/sequelize.js';
import { openPtyPair, type PtyPair } from '../../../simulator/transport/socat.js';
import { SECONDS_PER_HOUR } from '../../../shared/units/time.js';

const START_TIMEOUT_MS = 120_000;
const STOP_TIMEOUT_MS = 30_000;
/** The test MariaDB's port + this = the fault suite's own MariaDB (3317 → 3327 in CI). */
const FAULT_DB_PORT_OFFSET = 10;

/** The fault suite's MariaDB port: KNEEPOINT_FAULT_DB_PORT, else the test port + 10. */
export function faultDbPort(): number {
  if (process.env.KNEEPOINT_FAULT_DB_PORT) return Number(process.env.KNEEPOINT_FAULT_DB_PORT);
  return Number(process.env.KNEEPOINT_TEST_DB_PORT ?? 3317) + FAULT_DB_PORT_OFFSET;
}

function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const probe = createServer();
    probe.once('error', fail);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => ok(port));
    });
  });
}

/** A Kneepoint server in its own process with its own data directory and MariaDB. */
export interface FaultServer {
  url: string;
  dataDir: string;
  dbPort: number;
  /** Everything the server printed, for diagnosis and for the supervisor's log lines. */
  output(): string;
  /** The pid of the MariaDB serving this server's data now (it changes after a restart). */
  mariadbPid(): number;
  stop(): Promise<void>;
}

const SESSION_SECRET = 'fault-suite-session-secret-0123456789abcdef';
const DB_PASSWORD = 'fault-suite-db-password';

/** Starts `server/index.ts` in production mode on free ports, with an admin account made directly in its database. */
export async function startFaultServer(name: string, admin: { email: string; password: string }): Promise<FaultServer> {
  const dataDir = resolve(`.data/faults-${name}-${process.pid}`);
  rmSync(dataDir, { recursive: true, force: true });
  mkdirSync(dataDir, { recursive: true });
  const port = await freePort();
  const dbPort = faultDbPort();
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      KNEEPOINT_MODE: 'production',
      KNEEPOINT_PORT: String(port),
      KNEEPOINT_DATA_DIR: dataDir,
      KNEEPOINT_DB_PORT: String(dbPort),
      KNEEPOINT_CLIENT_DIR: join(dataDir, 'no-client'),
      SESSION_SECRET,
      KNEEPOINT_DB_PASSWORD: DB_PASSWORD,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  // The server's output is also kept in a file that outlives the data directory, for diagnosis.
  const logFile = resolve(`.data/faults-${name}-${process.pid}.log`);
  writeFileSync(logFile, '');
  const keep = (chunk: Buffer) => {
    out += chunk.toString();
    appendFileSync(logFile, chunk);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  const exited = new Promise<void>((done) => child.once('exit', () => done()));
  const pidFile = join(dataDir, 'mariadb', 'mariadbd.pid');
  const mariadbPid = () => Number(readFileSync(pidFile, 'utf8').trim());
  const killMariaDb = () => {
    try {
      if (existsSync(pidFile)) process.kill(mariadbPid(), 'SIGKILL');
    } catch {
      // already gone
    }
  };
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), STOP_TIMEOUT_MS);
      await exited;
      clearTimeout(timer);
    }
    killMariaDb(); // only if the server could not stop it
    rmSync(dataDir, { recursive: true, force: true });
  };
  const deadline = Date.now() + START_TIMEOUT_MS;
  while (!/Kneepoint is serving (\S+)/.test(out)) {
    if (child.exitCode !== null || Date.now() > deadline) {
      await stop();
      throw new Error(`The server did not start:\n${out}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const url = /Kneepoint is serving (\S+)/.exec(out)![1]!;
  // Production mode seeds nobody: make the admin straight in the server's database.
  const sequelize = createSequelize({ host: '127.0.0.1', port: dbPort, database: 'kneepoint', user: 'kneepoint', password: DB_PASSWORD });
  try {
    await defineCoreModels(sequelize).User.create({ email: admin.email, name: 'Fault Suite Admin', role: 'admin', passwordHash: await hashPassword(admin.password) });
  } finally {
    await sequelize.close();
  }
  return { url, dataDir, dbPort, output: () => out, mariadbPid, stop };
}

/** A parsed answer body: the tests read the fields they check, as the API documents them. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers of many shapes, checked field by field by expect()
export type Body = any;

/** A signed-in HTTP client (cookie and CSRF token) using fetch. */
export class ApiClient {
  private constructor(readonly url: string, readonly cookie: string, private readonly csrf: string) {}

  /** Signs in with email and password. */
  static async signIn(url: string, email: string, password: string): Promise<ApiClient> {
    const first = await fetch(`${url}/api/auth/csrf`);
    const cookie0 = first.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const { csrfToken } = (await first.json()) as { csrfToken: string };
    const login = await fetch(`${url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: cookie0 },
      body: JSON.stringify({ email, password }),
    });
    if (login.status !== 200) throw new Error(`sign-in answered ${login.status}: ${await login.text()}`);
    const body = (await login.json()) as { csrfToken: string };
    return new ApiClient(url, login.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), body.csrfToken);
  }

  /** Sends a request; resolves status, JSON body (or text) and how long the answer took. */
  async call(method: string, path: string, body?: unknown): Promise<{ status: number; body: Body; ms: number }> {
    const started = performance.now();
    const res = await fetch(`${this.url}${path}`, {
      method,
      headers: { cookie: this.cookie, 'x-csrf-token': this.csrf, ...(body !== undefined && { 'content-type': 'application/json' }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = JSON.parse(text);
    } catch {
      // CSV and other text stay text
    }
    return { status: res.status, body: parsed, ms: performance.now() - started };
  }

  /** Like call(), but throws unless the status is the expected one. */
  async expect(status: number, method: string, path: string, body?: unknown): Promise<Body> {
    const r = await this.call(method, path, body);
    if (r.status !== status) throw new Error(`${method} ${path} answered ${r.status}, expected ${status}: ${JSON.stringify(r.body)}`);
    return r.body;
  }
}

/** One frame as the meter sent it. */
export interface SentFrame {
  t: number;
  volts: number;
  amps: number;
}

/** A meter writing `t,volts,amps` lines into a pseudo-terminal at a fixed rate, keeping what it sent. */
export class PtyMeter {
  readonly sent: SentFrame[] = [];
  private timer: NodeJS.Timeout | undefined;
  private fd: number | undefined;

  private constructor(private readonly pair: PtyPair) {}

  /** Opens a socat pair; the bench reads `linkPath`. */
  static async open(linkPath: string): Promise<PtyMeter> {
    return new PtyMeter(await openPtyPair(linkPath));
  }

  get linkPath(): string {
    return this.pair.linkPath;
  }

  /** Starts sending at `hz`; frame k has t = k / hz s, a slowly falling voltage and a steady discharge current. */
  start(hz: number): void {
    this.fd ??= openSync(this.pair.devicePath, 'w');
    const periodSeconds = 1 / hz;
    this.timer = setInterval(() => {
      const k = this.sent.length;
      const frame = { t: +(k * periodSeconds).toFixed(3), volts: +(13.3 - k * 0.0002).toFixed(4), amps: +(18 + (k % 7) * 0.25).toFixed(2) };
      this.sent.push(frame);
      writeSync(this.fd!, `${frame.t},${frame.volts},${frame.amps}\n`);
    }, periodSeconds * 1000);
  }

  /** Stops sending (the pseudo-terminal stays open). */
  pause(): void {
    clearInterval(this.timer);
  }

  async close(): Promise<void> {
    this.pause();
    if (this.fd !== undefined) closeSync(this.fd);
    await this.pair.close();
  }
}

/** A run's readings received over /ws, as columns of run seconds and totals. */
export class LiveViewer {
  readonly elapsedSeconds: number[] = [];
  readonly dischargeWh: number[] = [];
  readonly receivedAtMs: number[] = [];
  private constructor(private readonly ws: WebSocket) {}

  /** Connects with the client's session and subscribes to the run. */
  static async watchRun(api: ApiClient, runId: number): Promise<LiveViewer> {
    const ws = new WebSocket(api.url.replace(/^http/, 'ws') + '/ws', { headers: { cookie: api.cookie, origin: api.url } });
    await new Promise<void>((ok, fail) => {
      ws.once('open', () => ok());
      ws.once('error', fail);
    });
    const viewer = new LiveViewer(ws);
    ws.on('message', (data: Buffer) => {
      const m = JSON.parse(data.toString()) as { type: string; readings?: { elapsedSeconds: number[]; dischargeWh?: number[] } };
      if (m.type !== 'batch' || !m.readings) return;
      for (let i = 0; i < m.readings.elapsedSeconds.length; i++) {
        viewer.elapsedSeconds.push(m.readings.elapsedSeconds[i]!);
        viewer.dischargeWh.push(m.readings.dischargeWh?.[i] ?? Number.NaN);
        viewer.receivedAtMs.push(Date.now());
      }
    });
    ws.send(JSON.stringify({ type: 'subscribe', topic: { kind: 'run', id: runId } }));
    return viewer;
  }

  /** Readings that arrived between two wall-clock times (ms). */
  countBetween(fromMs: number, toMs: number): number {
    return this.receivedAtMs.filter((ms) => ms >= fromMs && ms <= toMs).length;
  }

  close(): void {
    this.ws.close();
  }
}

/** The rows of a run's export.csv (metadata lines skipped) as numeric columns by header name. */
export function parseExportCsv(text: string): Record<string, number[]> {
  const lines = text.split('\n').filter((line) => line.length > 0 && !line.startsWith('#'));
  const header = lines[0]!.split(',');
  const cols: Record<string, number[]> = Object.fromEntries(header.map((h) => [h, []]));
  for (const line of lines.slice(1)) line.split(',').forEach((v, i) => cols[header[i]!]!.push(v === '' ? Number.NaN : Number(v)));
  return cols;
}

/**
 * Wh and Ah of the exported readings by an integration independent of the project's:
 * ml-spectra-processing's xyIntegration (npm; the plain trapezoidal rule) over the source
 * times, of V·I for energy and of I for charge, divided by 3600 s/h.
 */
export function referenceTotals(cols: Record<string, number[]>): { wh: number; ah: number } {
  const x = cols.t!;
  const watts = cols.volts!.map((v, i) => v * cols.amps![i]!);
  return {
    wh: xyIntegration({ x, y: watts }) / SECONDS_PER_HOUR,
    ah: xyIntegration({ x, y: cols.amps! }) / SECONDS_PER_HOUR,
  };
}

/** True when no value in the list is smaller than the one before it. */
export function neverDecreases(values: readonly number[]): boolean {
  return values.every((v, i) => i === 0 || v >= values[i - 1]!);
}

/** Polls `path` every `everyMs` until `stop()`; records each answer's status and time (status 0: no answer at all). */
export function pollApi(api: ApiClient, path: string, everyMs: number) {
  const answers: { atMs: number; status: number; ms: number; body: Body }[] = [];
  let running = true;
  const done = (async () => {
    while (running) {
      const atMs = Date.now();
      try {
        const r = await api.call('GET', path);
        answers.push({ atMs, status: r.status, ms: r.ms, body: r.body });
      } catch (err) {
        answers.push({ atMs, status: 0, ms: Date.now() - atMs, body: String(err) });
      }
      await new Promise((ok) => setTimeout(ok, everyMs));
    }
  })();
  return {
    answers,
    async stop() {
      running = false;
      await done;
    },
  };
}

/** Waits until `check` passes (no throw) or the time runs out. */
export async function eventually<T>(check: () => Promise<T>, timeoutMs = 20_000, everyMs = 200): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      return await check();
    } catch (err) {
      if (Date.now() > deadline) throw err;
      await new Promise((ok) => setTimeout(ok, everyMs));
    }
  }
}
