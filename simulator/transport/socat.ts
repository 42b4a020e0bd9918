import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, lstatSync, unlinkSync } from 'node:fs';
import { resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The checkout this file lives in (simulator/transport/ → the repository root). */
const MODULE_REPO_ROOT = fileURLToPath(new URL('../../', import.meta.url));

const START_TIMEOUT_MS = 5000;
const STOP_TIMEOUT_MS = 2000;
const PTY_LINE = /PTY is (\S+)/g;

/** A socat pseudo-terminal pair: the gateway opens `linkPath`, the meter writes to `devicePath`. */
export interface PtyPair {
  readonly linkPath: string;
  readonly devicePath: string;
  readonly process: ChildProcess;
  /** Stops socat; it removes the link, and the gateway's open port sees the device vanish. */
  close(): Promise<void>;
}

/**
 * Refuses a link inside the repository (outside .data/): Tailwind's file scan hangs on a
 * pseudo-terminal (DEVELOPERS.md, Conventions), so links live under /tmp.
 */
export function assertLinkOutsideRepo(linkPath: string, repoRoots = [process.cwd(), MODULE_REPO_ROOT]): void {
  const link = resolve(linkPath);
  for (const repoRoot of repoRoots) {
    const root = resolve(repoRoot) + sep;
    if (link.startsWith(root) && !link.startsWith(`${root}.data${sep}`)) {
      throw new Error(`Pseudo-terminal link ${link} is inside the repository; use a path under /tmp`);
    }
  }
}

/**
 * A link left by a killed socat points at a pseudo-terminal that is gone: remove it. A live
 * one belongs to another meter, and anything else is not ours to delete.
 */
function removeStaleLink(linkPath: string): void {
  let isLink: boolean;
  try {
    isLink = lstatSync(linkPath).isSymbolicLink();
  } catch {
    return;
  }
  if (!isLink || existsSync(linkPath)) throw new Error(`${linkPath} already exists (another simulated meter?)`);
  unlinkSync(linkPath);
}

/** Starts `socat` with two raw pseudo-terminals, one of them linked at linkPath. */
export function openPtyPair(linkPath: string): Promise<PtyPair> {
  assertLinkOutsideRepo(linkPath);
  try {
    removeStaleLink(linkPath);
  } catch (error) {
    return Promise.reject(error);
  }
  const child = spawn('socat', ['-d', '-d', `pty,raw,echo=0,link=${linkPath}`, 'pty,raw,echo=0'], {
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  const exited = new Promise<void>((done) => child.once('exit', () => done()));
  const close = async (): Promise<void> => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), STOP_TIMEOUT_MS);
    await exited;
    clearTimeout(timer);
  };
  return new Promise((ok, fail) => {
    let log = '';
    const timer = setTimeout(() => {
      void close();
      fail(new Error(`socat did not report its pseudo-terminals within ${START_TIMEOUT_MS} ms: ${log}`));
    }, START_TIMEOUT_MS);
    child.once('error', (error) => {
      clearTimeout(timer);
      fail(new Error(`cannot start socat (apt-get install socat): ${error.message}`));
    });
    child.stderr?.on('data', (chunk: Buffer) => {
      log += chunk.toString();
      const paths = [...log.matchAll(PTY_LINE)].map((m) => m[1]);
      // The data loop starts only after both ends exist and the link is in place.
      if (paths.length >= 2 && log.includes('starting data transfer loop')) {
        clearTimeout(timer);
        ok({ linkPath, devicePath: paths[1], process: child, close });
      }
    });
  });
}
