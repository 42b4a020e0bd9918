import { MS_PER_S } from '../../shared/units/time.js';
/**
 * How many messages one WebSocket client may send: a token bucket. The browser sends a
 * handful (a subscribe per topic on connect, a ping now and then); a client past these
 * figures is flooding, and each of its subscribes costs the server a snapshot.
 */

/** Messages a client may send at once (all 64 topics on a reconnect, many times over). */
export const CLIENT_MESSAGE_BURST = 1000;
/** Messages per second a client may keep sending. */
export const CLIENT_MESSAGES_PER_S = 500;


/** A token bucket of client messages on an injected clock. */
export class MessageRate {
  private tokens = CLIENT_MESSAGE_BURST;
  private lastMs: number;

  constructor(private readonly now: () => number = () => performance.now()) {
    this.lastMs = now();
  }

  /** Takes one message's token; false when the client is over its rate. */
  take(): boolean {
    const nowMs = this.now();
    this.tokens = Math.min(CLIENT_MESSAGE_BURST, this.tokens + ((nowMs - this.lastMs) * CLIENT_MESSAGES_PER_S) / MS_PER_S);
    this.lastMs = nowMs;
    if (this.tokens < 1) return false;
    this.tokens -= 1;
    return true;
  }
}
