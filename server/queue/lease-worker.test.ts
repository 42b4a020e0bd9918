import { describe, expect, it } from 'vitest';
import type { Logger } from '../log/logger.js';
import { IN_DOUBT_ERROR, type LeasedRow } from './lease-claim.js';
import { LeaseWorker, type HandledFailure, type LeaseWorkerOptions, type PollTimer } from './lease-worker.js';
import { afterFailure, type RetryPolicy } from './retry-policy.js';

/** The defaults of alarm delivery (KNEEPOINT_DELIVERY_RETRY_*): 5 s doubling to 5 min, 60 attempts. */
const POLICY: RetryPolicy = { firstMs: 5000, maxMs: 300_000, maxAttempts: 60 };
const LEASE_MS = 60_000;
const T0 = Date.UTC(2026, 0, 5, 9, 0, 0);

interface Row extends LeasedRow {
  status: 'pending' | 'sent' | 'failed';
  nextAttemptAtMs: number;
  claimedUntilMs: number | null;
  lastError: string | null;
}

/**
 * An in-memory queue with the contract of the SQL ones (server/queue/lease-claim.ts): a claim
 * counts the attempt and holds the row for the lease; a row whose lease ran out while still
 * claimed is taken again with the in-doubt note; release needs the claim's token.
 */
class MemoryQueue {
  rows: Row[] = [];
  private tokens = 0;

  add(count: number, atMs: number): void {
    for (let i = 0; i < count; i++)
      this.rows.push({ id: this.rows.length + 1, attempts: 0, claimToken: '', status: 'pending', nextAttemptAtMs: atMs, claimedUntilMs: null, lastError: null });
  }

  claim(now: Date, leaseMs: number, limit: number): Promise<Row[]> {
    const at = now.getTime();
    const token = `token-${++this.tokens}`;
    const due = this.rows.filter((r) => r.status === 'pending' && r.nextAttemptAtMs <= at && (r.claimedUntilMs === null || r.claimedUntilMs <= at)).slice(0, limit);
    for (const r of due) {
      r.attempts += 1;
      if (r.claimToken) r.lastError = IN_DOUBT_ERROR;
      r.claimToken = token;
      r.claimedUntilMs = at + leaseMs;
    }
    return Promise.resolve(due.map((r) => ({ ...r })));
  }

  private held(row: Row): Row | undefined {
    return this.rows.find((r) => r.id === row.id && r.claimToken === row.claimToken);
  }

  markSent(row: Row): Promise<void> {
    const r = this.held(row);
    if (r) Object.assign(r, { status: 'sent', claimToken: '', claimedUntilMs: null, lastError: r.lastError === IN_DOUBT_ERROR ? r.lastError : null });
    return Promise.resolve();
  }

  markFailed(row: Row, error: string, now: Date, permanent: boolean): Promise<string> {
    const { status, nextAttemptAt } = afterFailure(POLICY, row.attempts, now, permanent);
    const r = this.held(row);
    if (r) Object.assign(r, { status, lastError: error, nextAttemptAtMs: nextAttemptAt.getTime(), claimToken: '', claimedUntilMs: null });
    return Promise.resolve(status);
  }
}

/** A poll timer the test fires by hand. */
class ManualTimer implements PollTimer {
  callbacks = new Set<() => void>();
  setInterval(callback: () => void) {
    this.callbacks.add(callback);
    return { callback };
  }
  clearInterval(handle: unknown) {
    this.callbacks.delete((handle as { callback: () => void }).callback);
  }
  fire() {
    for (const c of this.callbacks) c();
  }
}

class PermanentError extends Error {}

function setup(handle: (row: Row) => Promise<HandledFailure | void>, queue = new MemoryQueue()) {
  let nowMs = T0;
  const warnings: string[] = [];
  const log: Logger = { info: () => undefined, warn: (m) => void warnings.push(m), error: (m) => void warnings.push(m) };
  const timer = new ManualTimer();
  const options: LeaseWorkerOptions<Row> = {
    name: 'test queue', handle, log, timer,
    claim: (now, leaseMs, limit) => queue.claim(now, leaseMs, limit),
    markSent: (row) => queue.markSent(row),
    markFailed: (row, error, now, permanent) => queue.markFailed(row, error, now, permanent),
    isPermanent: (err) => err instanceof PermanentError,
    describe: (row) => `test row ${row.id}`,
    pollMs: 500, leaseMs: LEASE_MS, claimBatch: 2, nowMs: () => nowMs,
  };
  const worker = new LeaseWorker(options);
  return { worker, queue, warnings, timer, options, setNow: (ms: number) => void (nowMs = ms) };
}

describe('LeaseWorker', () => {
  it('sends every due row, claiming in batches until none is left, and counts one attempt each', async () => {
    const sent: number[] = [];
    const { worker, queue } = setup(async (row) => void sent.push(row.id));
    queue.add(5, T0);
    worker.kick();
    await worker.settled();
    expect(sent).toEqual([1, 2, 3, 4, 5]);
    expect(queue.rows.map((r) => [r.status, r.attempts])).toEqual(Array(5).fill(['sent', 1]));
  });

  it('retries a failed row after its back-off, not before (5 s, then 10 s: doubling, common practice)', async () => {
    let failing = true;
    const { worker, queue, warnings, setNow } = setup(async () => {
      if (failing) throw new Error('connection refused');
    });
    queue.add(1, T0);
    worker.kick();
    await worker.settled();
    expect(queue.rows[0]).toMatchObject({ status: 'pending', attempts: 1, lastError: 'connection refused', nextAttemptAtMs: T0 + 5000 });
    expect(warnings).toEqual(['test row 1 failed, will retry']);

    setNow(T0 + 4999);
    worker.kick();
    await worker.settled();
    expect(queue.rows[0]!.attempts).toBe(1);

    setNow(T0 + 5000);
    worker.kick();
    await worker.settled();
    expect(queue.rows[0]).toMatchObject({ status: 'pending', attempts: 2, nextAttemptAtMs: T0 + 5000 + 10_000 });

    failing = false;
    setNow(T0 + 15_000);
    worker.kick();
    await worker.settled();
    expect(queue.rows[0]).toMatchObject({ status: 'sent', attempts: 3, lastError: null });
  });

  it('gives a row up at once on a permanent error, and one failing row does not stop the others', async () => {
    const { worker, queue, warnings } = setup(async (row) => {
      if (row.id === 1) throw new PermanentError('bad address');
    });
    queue.add(2, T0);
    worker.kick();
    await worker.settled();
    expect(queue.rows.map((r) => r.status)).toEqual(['failed', 'sent']);
    expect(warnings).toEqual(['test row 1 failed, given up']);
  });

  it('notes a failure the handler reports without a warning', async () => {
    const { worker, queue, warnings } = setup(async () => ({ error: 'the alarm no longer exists', permanent: true }));
    queue.add(1, T0);
    worker.kick();
    await worker.settled();
    expect(queue.rows[0]).toMatchObject({ status: 'failed', lastError: 'the alarm no longer exists' });
    expect(warnings).toEqual([]);
  });

  it('gives up once the attempts are spent', () => {
    // The 60th failed attempt of the default policy is the last (KNEEPOINT_DELIVERY_MAX_ATTEMPTS).
    expect(afterFailure(POLICY, 59, new Date(T0), false).status).toBe('pending');
    expect(afterFailure(POLICY, 60, new Date(T0), false).status).toBe('failed');
    // The wait is capped at the longest one: 5 s × 2^59 is far past 5 min.
    expect(afterFailure(POLICY, 60, new Date(T0), false).nextAttemptAt.getTime()).toBe(T0 + 300_000);
  });

  it('runs one more turn after a kick that came during a turn; turns never overlap', async () => {
    let inFlight = 0;
    let most = 0;
    let release!: () => void;
    const gate = new Promise<void>((resolve) => (release = resolve));
    const { worker, queue } = setup(async () => {
      most = Math.max(most, ++inFlight);
      await gate;
      inFlight--;
    });
    queue.add(1, T0);
    worker.kick();
    queue.add(1, T0);
    worker.kick();
    worker.kick();
    release();
    await worker.settled();
    expect(queue.rows.map((r) => r.status)).toEqual(['sent', 'sent']);
    expect(most).toBe(1);
  });

  it('polls on its timer once started and stops polling when stopped', async () => {
    const sent: number[] = [];
    const { worker, queue, timer } = setup(async (row) => void sent.push(row.id));
    worker.start();
    await worker.settled();
    queue.add(1, T0);
    timer.fire();
    await worker.settled();
    expect(sent).toEqual([1]);
    await worker.stop();
    queue.add(1, T0);
    timer.fire();
    worker.kick();
    await worker.settled();
    expect(sent).toEqual([1]);
    expect(timer.callbacks.size).toBe(0);
  });

  it('leaves a row a stopped server held until its 60 s lease ends, then sends it again marked in doubt', async () => {
    const queue = new MemoryQueue();
    queue.add(1, T0);
    // The first server hands the row over and dies before it can mark it: its send never returns.
    const dead = setup(() => new Promise<void>(() => undefined), queue);
    dead.worker.kick();
    await Promise.resolve();
    expect(queue.rows[0]).toMatchObject({ attempts: 1, claimedUntilMs: T0 + LEASE_MS });

    const sent: number[] = [];
    const next = setup(async (row) => void sent.push(row.id), queue);
    next.setNow(T0 + LEASE_MS - 1);
    next.worker.kick();
    await next.worker.settled();
    expect(sent).toEqual([]);

    next.setNow(T0 + LEASE_MS);
    next.worker.kick();
    await next.worker.settled();
    expect(sent).toEqual([1]);
    expect(queue.rows[0]).toMatchObject({ status: 'sent', attempts: 2, lastError: IN_DOUBT_ERROR });
  });
});
