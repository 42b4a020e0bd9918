import type { ScpiFormat } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import type { TimerHandle } from '../clock.js';
import { LineFramer } from '../framer/line-framer.js';
import { parseScpiNumber } from '../parsers/scpi-reply.js';
import { toAmps } from '../parsers/units.js';
import type { PortSession, SessionContext } from './port-session.js';
import { MS_PER_S } from '../../../shared/units/time.js';


/**
 * Polls a SCPI instrument: asks `*IDN?` once, then every `pollMs` sends the volts, amps
 * and temperature queries one at a time and waits for each reply (with a timeout). A
 * cycle with a missing or bad reply is counted as a rejection; the next cycle still runs
 * (a late reply that arrives between cycles has no waiter and is dropped).
 */
export function startScpiSession(ctx: SessionContext, format: ScpiFormat): PortSession {
  const { clock, port, tracker } = ctx;
  const framer = new LineFramer();
  let stopped = false;
  let pending: { resolve: (line: string | undefined) => void; timer: TimerHandle } | undefined;
  let nextPoll: TimerHandle | undefined;

  const onData = (chunk: Buffer): void => {
    for (const line of framer.push(chunk)) {
      // A reply nobody waits for (late, after a timeout) is dropped so it cannot pair with the next query.
      const waiter = pending;
      if (!waiter) continue;
      pending = undefined;
      clock.clearTimeout(waiter.timer);
      waiter.resolve(line);
    }
  };
  port.on('data', onData);

  const ask = (query: string): Promise<string | undefined> =>
    new Promise((resolve) => {
      const timer = clock.setTimeout(() => {
        pending = undefined;
        resolve(undefined);
      }, format.replyTimeoutMs);
      pending = { resolve, timer };
      port.write(query + format.lineEnding);
    });

  const askNumber = async (query: string): Promise<number | string> => {
    const reply = await ask(query);
    if (reply === undefined) return `no reply to ${query} within ${format.replyTimeoutMs} ms`;
    const parsed = parseScpiNumber(reply);
    return parsed.ok ? parsed.value : `${query}: ${parsed.reason}`;
  };

  const cycle = async (): Promise<void> => {
    const startMs = clock.nowMs();
    const queries: [string, string][] = [
      ['volts', format.queries.volts],
      ['amps', format.queries.amps],
      ...Object.entries(format.queries.temps).map(([channel, q]): [string, string] => [`temp:${channel}`, q]),
    ];
    const values = new Map<string, number>();
    let failure: string | undefined;
    // Stop at the first failure: a reply arriving after its timeout must not pair with the next query.
    for (const [name, query] of queries) {
      if (stopped) return;
      const value = await askNumber(query);
      if (typeof value === 'string') {
        failure = value;
        break;
      }
      values.set(name, value);
    }
    const temps: Record<string, number> = {};
    for (const [name, value] of values) if (name.startsWith('temp:')) temps[name.slice('temp:'.length)] = value;
    const volts = values.get('volts');
    const amps = values.get('amps');
    if (stopped) return;
    if (failure !== undefined || volts === undefined || amps === undefined) tracker.rejected(failure ?? 'incomplete reply set');
    else {
      // Replies carry no time; stamp the moment the cycle began (the volts query), on the arrival clock.
      const frame: Frame = {
        t: startMs / MS_PER_S,
        volts,
        amps: toAmps(amps, 'A', format.currentSign),
        clock: 'arrival',
        ...(Object.keys(temps).length > 0 && { temps }),
      };
      ctx.emitFrame(frame);
    }
    const elapsedMs = clock.nowMs() - startMs;
    nextPoll = clock.setTimeout(() => void cycle(), Math.max(0, format.pollMs - elapsedMs));
  };

  const begin = async (): Promise<void> => {
    if (format.idnQuery) {
      const idn = await ask(format.idnQuery);
      if (stopped) return;
      if (idn !== undefined) tracker.note(`instrument: ${idn.trim().slice(0, 120)}`);
    }
    if (!stopped) await cycle();
  };
  void begin();

  return {
    stop: () => {
      stopped = true;
      port.off('data', onData);
      if (nextPoll !== undefined) clock.clearTimeout(nextPoll);
      if (pending) {
        clock.clearTimeout(pending.timer);
        pending.resolve(undefined);
        pending = undefined;
      }
    },
  };
}
