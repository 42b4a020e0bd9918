import type { Clock, TimerHandle } from '../ingest/clock.js';
import { LineFramer } from '../ingest/framer/line-framer.js';
import type { SerialPortLike } from '../ingest/sources/serial-port-factory.js';

/** What one exchange on the line gave: the reply line, or why there is none. */
export type ExchangeResult = { reply: string } | { problem: string };

/**
 * One command at a time on a line-oriented port (SCPI over serial). A query waits for one
 * reply line up to the timeout; a command without reply is only written. Calls queue up, so
 * a programme step and the safety net never interleave their bytes. A reply that arrives
 * with nobody waiting (late, after a timeout) is dropped; after a timeout the next query also
 * waits out one more timeout first, so a late reply cannot answer it. Commands without a reply
 * (an output off) are never held back.
 */
export class LineExchange {
  private readonly framer = new LineFramer();
  private waiter: { resolve: (r: ExchangeResult) => void; timer: TimerHandle } | undefined;
  private queue: Promise<unknown> = Promise.resolve();
  private closedReason: string | undefined;
  /** Until when (clock ms) a late reply to a timed-out query may still arrive. */
  private quietUntilMs = 0;
  /** Replies nobody waited for. */
  lateReplies = 0;

  constructor(
    private readonly port: SerialPortLike,
    private readonly clock: Clock,
    private readonly lineEnding: string,
  ) {
    port.on('data', this.onData);
    port.on('close', this.onClose);
    port.on('error', this.onError);
  }

  /** Sends a query and waits for its reply line. */
  query(text: string, timeoutMs: number): Promise<ExchangeResult> {
    return this.enqueue(() => this.send(text, timeoutMs));
  }

  /** Sends a command that has no reply. */
  command(text: string): Promise<ExchangeResult | undefined> {
    return this.enqueue(async () => this.write(text));
  }

  /** Detaches from the port (does not close it). */
  detach(reason: string): void {
    this.closedReason ??= reason;
    this.port.off('data', this.onData);
    this.port.off('close', this.onClose);
    this.port.off('error', this.onError);
    this.finish({ problem: reason });
  }

  private enqueue<T>(job: () => Promise<T>): Promise<T> {
    const next = this.queue.then(job, job);
    this.queue = next.catch(() => undefined);
    return next;
  }

  private write(text: string): { problem: string } | undefined {
    if (this.closedReason !== undefined) return { problem: this.closedReason };
    if (!this.port.isOpen) return { problem: 'port is not open' };
    this.port.write(text + this.lineEnding);
    return undefined;
  }

  private async send(text: string, timeoutMs: number): Promise<ExchangeResult> {
    const waitMs = this.quietUntilMs - this.clock.nowMs();
    if (waitMs > 0) await new Promise<void>((resolve) => this.clock.setTimeout(resolve, waitMs));
    const failed = this.write(text);
    if (failed) return Promise.resolve(failed);
    return new Promise((resolve) => {
      const timer = this.clock.setTimeout(() => {
        this.quietUntilMs = this.clock.nowMs() + timeoutMs;
        this.finish({ problem: `no reply within ${timeoutMs} ms` });
      }, timeoutMs);
      this.waiter = { resolve, timer };
    });
  }

  private finish(result: ExchangeResult): void {
    const waiter = this.waiter;
    if (!waiter) return;
    this.waiter = undefined;
    this.clock.clearTimeout(waiter.timer);
    waiter.resolve(result);
  }

  private readonly onData = (chunk: Buffer): void => {
    for (const line of this.framer.push(chunk)) {
      if (this.waiter) this.finish({ reply: line });
      else this.lateReplies += 1;
    }
  };

  private readonly onClose = (): void => {
    this.closedReason ??= 'port closed';
    this.finish({ problem: this.closedReason });
  };

  private readonly onError = (err: Error): void => {
    this.closedReason ??= `port error: ${err.message}`;
    this.finish({ problem: this.closedReason });
  };
}
