/* global process, console */
// `npm start`: build the client (vite) and the server (tsc → dist/node) when their sources
// changed since the last build, then run the compiled server (which provisions MariaDB,
// migrates, seeds the demo lab and serves http://127.0.0.1:8080). `npm start -- --rebuild`
// forces both builds.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const bin = (name) => join(root, 'node_modules', '.bin', name);
const force = process.argv.includes('--rebuild');
const SKIPPED_DIRS = new Set(['node_modules', 'dist', '.data', '.git', 'coverage']);

/** Newest modification time (ms) of the regular files under the given paths. */
function newestMtimeMs(paths) {
  let newest = 0;
  const visit = (path) => {
    if (!existsSync(path)) return;
    const stats = statSync(path);
    if (stats.isDirectory()) {
      for (const entry of readdirSync(path)) if (!SKIPPED_DIRS.has(entry)) visit(join(path, entry));
    } else if (stats.isFile()) {
      newest = Math.max(newest, stats.mtimeMs);
    }
  };
  paths.forEach((path) => visit(join(root, path)));
  return newest;
}

/** Runs a build step unless its stamp is newer than every input; stops npm start on failure. */
function buildIfStale(label, inputs, stamp, command, args) {
  const stampFile = join(root, stamp);
  const stampMs = existsSync(stampFile) ? statSync(stampFile).mtimeMs : 0;
  if (!force && stampMs > newestMtimeMs(inputs)) {
    console.log(`[start] ${label}: up to date`);
    return;
  }
  console.log(`[start] ${label}: building…`);
  const started = Date.now();
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error(`[start] ${label} failed (exit ${result.status}); fix the errors above and run npm start again.`);
    process.exit(1);
  }
  mkdirSync(dirname(stampFile), { recursive: true });
  writeFileSync(stampFile, new Date().toISOString());
  console.log(`[start] ${label}: built in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

const common = ['shared', 'package.json', 'package-lock.json'];
buildIfStale('client', ['src', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'postcss.config.js', 'tsconfig.json', ...common],
  'dist/client/.built', bin('vite'), ['build', '--logLevel', 'warn']);
buildIfStale('server', ['server', 'simulator', 'tsconfig.node.json', ...common],
  'dist/node/.built', bin('tsc'), ['-p', 'server/tsconfig.json']);

// ── DEMO BENCH: the ingest area starts the simulator-backed demo bench here (or as a demo-mode
// attachment in server/index.ts) when it needs a separate process. ──

const server = spawn(process.execPath, ['--enable-source-maps', join(root, 'dist/node/server/index.js')], {
  cwd: root,
  stdio: 'inherit',
});
// Ctrl-C reaches both processes; the server stops itself (and MariaDB) and we wait for it.
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => server.kill('SIGTERM'));
}
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
