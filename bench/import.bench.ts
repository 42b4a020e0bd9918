/**
 * Import benchmark (issue 9 wants a 1,000,000-row CSV imported in under 5 s): writes a log of
 * a million rows (0.1 s cadence, time in ms, volts, amps, temperature) to disk, then posts it
 * as users do: multipart to POST /api/runs/import on a real server (multer to disk, sniff,
 * check pass, integrate-and-archive pass into MariaDB, summary). Prints the time from the
 * first byte sent to the answer, and the rows per second, and (from the progress the server
 * reports, polled every 50 ms as the client does) when the upload was in and when every row
 * had been checked. Node CPU counts the server and this client together (one process).
 * Figures go to docs/benchmarks.md.
 */
import { createWriteStream, openAsBlob } from 'node:fs';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { hashPassword } from '../server/auth/password.js';
import { startServer } from '../server/server.js';
import { testConfig } from '../tests/integration/helpers/test-config.js';
import { openBenchDb } from './bench-db.js';

const ROWS = 1_000_000;
const STEP_MS = 100;
const CHUNK_ROWS = 10_000;
const PASSWORD = 'bench-import-password';
const EMAIL = 'importer@northgate.example';
const PROGRESS_ID = 'bench-import-million';
/** How often the benchmark asks how far the import has got (the phases are timed to this). */
const POLL_MS = 50;

/** A slow constant-current discharge, as a logger would write it. */
async function writeLog(path: string): Promise<void> {
  const out = createWriteStream(path);
  out.write('Time (ms),Voltage (V),Current (A),Temp (°C)\n');
  for (let i = 0; i < ROWS; i += CHUNK_ROWS) {
    let chunk = '';
    for (let j = i; j < i + CHUNK_ROWS; j++) chunk += `${j * STEP_MS},${(13.3 - j * 2e-6).toFixed(6)},4,${(25 + (j % 50) / 100).toFixed(2)}\n`;
    if (!out.write(chunk)) await new Promise<void>((r) => out.once('drain', () => r()));
  }
  await new Promise<void>((r) => out.end(() => r()));
}

/** Signs in and returns the session cookie and the post-login CSRF token. */
async function signIn(url: string): Promise<{ cookie: string; csrfToken: string }> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const first = csrf.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken, cookie: first },
    body: JSON.stringify({ email: EMAIL, password: PASSWORD }),
  });
  if (login.status !== 200) throw new Error(`login ${login.status}`);
  const body = (await login.json()) as { csrfToken: string };
  return { cookie: login.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), csrfToken: body.csrfToken };
}

/** Runs the benchmark and returns its figures. */
export async function run(): Promise<Record<string, string | number>> {
  const dir = await mkdtemp(join(tmpdir(), 'kp-import-bench-'));
  const db = await openBenchDb('import');
  const server = await startServer({
    config: testConfig(db.mariadb, { dataDir: join(dir, 'data') }),
    database: db.mariadb,
    port: 0,
    log: { info: () => {}, warn: () => {}, error: (m, e) => console.error(m, e) },
  });
  try {
    await server.ctx.models.User.create({ email: EMAIL, name: 'Bench Importer', role: 'technician', passwordHash: await hashPassword(PASSWORD) });
    const url = `http://127.0.0.1:${server.port}`;
    const { cookie, csrfToken } = await signIn(url);
    const path = join(dir, 'million.csv');
    await writeLog(path);
    const bytes = (await stat(path)).size;
    const form = new FormData();
    form.set('name', 'bench million');
    form.set('progressId', PROGRESS_ID);
    form.set('file', await openAsBlob(path), 'million.csv');
    const [load1] = loadavg();
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    // Follows the server's progress as the client does, to time the phases: upload, check, import.
    const phaseAtMs: Record<string, number> = {};
    let answered = false;
    const follow = (async () => {
      while (!answered) {
        const p = await fetch(`${url}/api/runs/import/progress/${PROGRESS_ID}`, { headers: { cookie } });
        if (p.status === 200) {
          const { phase } = (await p.json()) as { phase: string };
          phaseAtMs[phase] ??= performance.now() - t0;
        } else await p.arrayBuffer();
        await new Promise((r) => setTimeout(r, POLL_MS));
      }
    })();
    const res = await fetch(`${url}/api/runs/import`, { method: 'POST', headers: { cookie, 'x-csrf-token': csrfToken }, body: form });
    const body = (await res.json()) as { summary?: { rows: number; dischargeAh: number }; error?: unknown };
    const seconds = (performance.now() - t0) / 1000;
    answered = true;
    await follow;
    const cpu = process.cpuUsage(c0);
    if (res.status !== 201 || !body.summary) throw new Error(`import answered ${res.status}: ${JSON.stringify(body).slice(0, 300)}`);
    const figures = {
      rows: body.summary.rows,
      fileMB: (bytes / 1e6).toFixed(1),
      importTotalSeconds: seconds.toFixed(2),
      uploadedByS: ((phaseAtMs.checking ?? Number.NaN) / 1000).toFixed(2),
      checkedByS: ((phaseAtMs.importing ?? Number.NaN) / 1000).toFixed(2),
      rowsPerSecond: Math.round(ROWS / seconds),
      nodeCpuS: ((cpu.user + cpu.system) / 1e6).toFixed(2),
      loadAverage1m: load1!.toFixed(1),
      dischargeAh: body.summary.dischargeAh.toFixed(6),
    };
    console.log(figures);
    return figures;
  } finally {
    await server.close();
    await db.close();
    await rm(dir, { recursive: true, force: true });
  }
}
