import { readFileSync, readdirSync, existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';

const execFileAsync = promisify(execFile);

/** Reads a process's command line, or undefined when there is no such process. */
function readCmdline(pid: number): string[] | undefined {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').filter(Boolean);
  } catch {
    return undefined;
  }
}

/** True when `pid` is a mariadbd whose command line names `dataDir`. */
function isMariaDbOn(pid: number, dataDir: string): boolean {
  const args = readCmdline(pid);
  if (!args) return false;
  return args.some((arg) => arg.endsWith('mariadbd') || arg.endsWith('mysqld')) && args.includes(`--datadir=${dataDir}`);
}

/**
 * Finds a mariadbd already serving `dataDir`: first via the pid file, then by scanning /proc
 * (a second server on the same files would hang 30 s on InnoDB locks before failing).
 */
export function findRunningMariaDb(dataDir: string, pidFile: string): number | undefined {
  if (existsSync(pidFile)) {
    const pid = Number(readFileSync(pidFile, 'utf8').trim());
    if (Number.isInteger(pid) && pid > 0 && isMariaDbOn(pid, dataDir)) return pid;
  }
  for (const entry of readdirSync('/proc')) {
    const pid = Number(entry);
    if (Number.isInteger(pid) && pid !== process.pid && isMariaDbOn(pid, dataDir)) return pid;
  }
  return undefined;
}

/** Resolves true when nothing listens on host:port (we could bind it ourselves). */
export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolvePromise) => {
    const probe = createServer();
    probe.once('error', () => resolvePromise(false));
    probe.listen({ port, host, exclusive: true }, () => probe.close(() => resolvePromise(true)));
  });
}

/** True while a process with this pid exists. */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** True when the process is stopped by a signal (SIGSTOP, state T in /proc/<pid>/stat). */
export function isStopped(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // The state follows the command name in parentheses, which may itself hold spaces.
    return /^[Tt]$/.test(stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3));
  } catch {
    return false;
  }
}

/** Asks the server over its Unix socket whether it answers. */
export async function pingOverSocket(adminPath: string, socketPath: string, osUser: string): Promise<boolean> {
  try {
    await execFileAsync(adminPath, ['--no-defaults', `--socket=${socketPath}`, `--user=${osUser}`, '--connect-timeout=2', 'ping'], {
      timeout: 5_000,
    });
    return true;
  } catch {
    return false;
  }
}

const POLL_INTERVAL_MS = 100;

/** Waits until `check` is true, `abort` returns an error, or the timeout passes. */
export async function waitFor(
  check: () => Promise<boolean> | boolean,
  timeoutMs: number,
  abort: () => Error | undefined = () => undefined,
): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const failure = abort();
    if (failure) throw failure;
    if (await check()) return;
    if (Date.now() > deadline) throw new Error(`Timed out after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, POLL_INTERVAL_MS));
  }
}

/** Stops a mariadbd with SIGTERM (a clean shutdown) and waits for it to exit. */
export async function stopMariaDb(pid: number, timeoutMs = 30_000): Promise<void> {
  if (!isAlive(pid)) return;
  process.kill(pid, 'SIGTERM');
  try {
    await waitFor(() => !isAlive(pid), timeoutMs);
  } catch {
    // A server that ignores SIGTERM this long is stuck; InnoDB recovers after SIGKILL.
    process.kill(pid, 'SIGKILL');
  }
}
