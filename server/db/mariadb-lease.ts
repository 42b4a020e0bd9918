import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import { isAlive, waitFor } from './mariadb-process.js';

const LOCK_TIMEOUT_MS = 10 * 60_000; // a first start may install MariaDB with apt-get

/**
 * Serialises start and stop of one private MariaDB across processes (two `npm test` runs, an
 * e2e run beside an integration run): an atomic mkdir lock; a lock whose owner died is broken.
 */
export async function withStartStopLock<T>(baseDir: string, work: () => Promise<T>): Promise<T> {
  const lockDir = join(baseDir, 'lock');
  const tryTake = () => {
    try {
      mkdirSync(lockDir);
      writeFileSync(join(lockDir, 'owner'), String(process.pid));
      return true;
    } catch {
      const owner = Number(safeRead(join(lockDir, 'owner')));
      // No owner file yet means someone is between mkdir and write: give them time.
      if (Number.isInteger(owner) && owner > 0 && !isAlive(owner)) rmSync(lockDir, { recursive: true, force: true });
      return false;
    }
  };
  await waitFor(tryTake, LOCK_TIMEOUT_MS);
  try {
    return await work();
  } finally {
    rmSync(lockDir, { recursive: true, force: true });
  }
}

function safeRead(file: string): string {
  try {
    return readFileSync(file, 'utf8').trim();
  } catch {
    return '';
  }
}

/** Pids holding live leases on this MariaDB; leases of dead processes are removed. */
export function liveLeaseHolders(baseDir: string): number[] {
  const leaseDir = join(baseDir, 'leases');
  mkdirSync(leaseDir, { recursive: true });
  const holders: number[] = [];
  for (const name of readdirSync(leaseDir)) {
    const pid = Number(safeRead(join(leaseDir, name)));
    if (Number.isInteger(pid) && pid > 0 && isAlive(pid)) holders.push(pid);
    else rmSync(join(leaseDir, name), { force: true });
  }
  return holders;
}

/** Records that this process uses the server; returns a function that drops the lease. */
export function takeLease(baseDir: string): () => void {
  const leaseDir = join(baseDir, 'leases');
  mkdirSync(leaseDir, { recursive: true });
  const file = join(leaseDir, `${process.pid}-${randomBytes(4).toString('hex')}`);
  writeFileSync(file, String(process.pid));
  return () => rmSync(file, { force: true });
}
