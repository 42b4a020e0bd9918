/** Retry policy of a durable queue: first wait, longest wait, attempts before giving up. */
export interface RetryPolicy {
  firstMs: number;
  maxMs: number;
  maxAttempts: number;
}

/** Wait before retry number `attempts` (1 = the first retry): doubling from `firstMs`, capped at `maxMs`. */
export function retryDelayMs(attempts: number, firstMs: number, maxMs: number): number {
  return Math.min(maxMs, firstMs * 2 ** Math.max(0, attempts - 1));
}

/**
 * What becomes of a row whose attempt number `attempts` failed: it is given up when the
 * failure is permanent or the attempts are spent, else it waits its back-off.
 */
export function afterFailure(policy: RetryPolicy, attempts: number, now: Date, permanent: boolean): { status: 'pending' | 'failed'; nextAttemptAt: Date } {
  const status = permanent || attempts >= policy.maxAttempts ? 'failed' : 'pending';
  return { status, nextAttemptAt: new Date(now.getTime() + retryDelayMs(attempts, policy.firstMs, policy.maxMs)) };
}
