import { describe, expect, it } from 'vitest';
import { CLIENT_MESSAGE_BURST, CLIENT_MESSAGES_PER_S, MessageRate } from './message-rate.js';

describe('MessageRate', () => {
  it('allows a burst, then refuses until time refills it at the steady rate', () => {
    let now = 0;
    const rate = new MessageRate(() => now);
    for (let i = 0; i < CLIENT_MESSAGE_BURST; i++) expect(rate.take()).toBe(true);
    expect(rate.take()).toBe(false);
    now += 1000 / CLIENT_MESSAGES_PER_S; // one message's worth
    expect(rate.take()).toBe(true);
    expect(rate.take()).toBe(false);
  });

  it('a client at the steady rate is never refused', () => {
    let now = 0;
    const rate = new MessageRate(() => now);
    for (let i = 0; i < 10 * CLIENT_MESSAGE_BURST; i++) {
      now += 1000 / CLIENT_MESSAGES_PER_S;
      expect(rate.take()).toBe(true);
    }
  });
});
