import { describe, expect, it } from 'vitest';
import type { BenchStatus } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { ManualClock } from '../ingest/testing/manual-clock.js';
import { GatewaySource, type GatewaySourceLink } from './gateway-source.js';

class FakeLink implements GatewaySourceLink {
  connected = true;
  online = true;
  registered = true;
  attached = new Map<number, GatewaySource>();
  attach(benchId: number, source: GatewaySource) {
    this.attached.set(benchId, source);
  }
  detach(benchId: number) {
    this.attached.delete(benchId);
  }
  gateway() {
    return this.registered ? { name: 'room-2', online: this.online } : null;
  }
}

const STALE_AFTER_S = 5;
const bench = { id: 4, gatewayId: 9, enabled: true, source: { kind: 'simulator' as const, scenario: 'lfp-12v-weak-cell', speed: 1, seed: 1, staleAfterSeconds: STALE_AFTER_S, limits: { maxAbsVolts: 2000, maxAbsAmps: 5000, minTempCelsius: -100, maxTempCelsius: 300 } } };
const receiving: BenchStatus = { state: 'receiving', message: 'simulating', framesOk: 3, framesRejected: 1, lastRejection: 'line 2: garbled' };
const frame = (t: number): Frame => ({ t, volts: 13, amps: 5, clock: 'device' });

function setup() {
  const clock = new ManualClock(0);
  const link = new FakeLink();
  const frames: Frame[] = [];
  const statuses: BenchStatus[] = [];
  const source = new GatewaySource(bench, { frame: (f) => frames.push(f), status: (s) => statuses.push(s) }, link, clock);
  return { clock, link, frames, statuses, source };
}

describe('the stand-in source of a gateway bench', () => {
  it('passes frames on and takes the meter status the gateway reports, counts and rejections included', () => {
    const { source, frames, statuses, link } = setup();
    source.start();
    expect(link.attached.get(4)).toBe(source);
    expect(statuses.at(-1)?.state).toBe('connected');
    source.remoteStatus(receiving);
    source.frame(frame(0));
    source.frame(frame(1));
    expect(frames.map((f) => f.t)).toEqual([0, 1]);
    expect(source.getStatus()).toMatchObject({ state: 'receiving', message: 'simulating', framesOk: 2, framesRejected: 1, lastRejection: 'line 2: garbled' });
  });

  it('says so when the gateway goes offline or the broker is out of reach, and recovers', () => {
    const { source, statuses, link } = setup();
    source.start();
    source.remoteStatus(receiving);
    link.online = false;
    source.reachabilityChanged();
    expect(statuses.at(-1)).toMatchObject({ state: 'reconnecting', message: 'gateway room-2 offline' });
    link.online = true;
    link.connected = false;
    source.reachabilityChanged();
    expect(statuses.at(-1)).toMatchObject({ state: 'reconnecting', message: 'no connection to the MQTT broker' });
    link.connected = true;
    source.reachabilityChanged();
    expect(statuses.at(-1)?.state).toBe('receiving');
  });

  it('goes stale after the bench’s no-data time without a frame, and a frame brings it back', () => {
    const { source, statuses, clock } = setup();
    source.start();
    source.remoteStatus(receiving);
    source.frame(frame(0));
    clock.advance(STALE_AFTER_S * 1000 - 1);
    expect(statuses.at(-1)?.state).toBe('receiving');
    clock.advance(1);
    expect(statuses.at(-1)).toMatchObject({ state: 'stale', message: `no frame from gateway room-2 for ${STALE_AFTER_S} s` });
    source.frame(frame(1));
    expect(statuses.at(-1)?.state).toBe('receiving');
  });

  it('is an error when its gateway was revoked, and delivers nothing once stopped', async () => {
    const { source, frames, link } = setup();
    source.start();
    link.registered = false;
    source.reachabilityChanged();
    expect(source.getStatus().state).toBe('error');
    await source.stop();
    source.frame(frame(5));
    expect(frames).toEqual([]);
    expect(link.attached.size).toBe(0);
  });

  it('takes no frame and no status from a revoked gateway, even one the broker queued before it read the revocation', () => {
    const { source, frames, link } = setup();
    source.start();
    source.remoteStatus(receiving);
    source.frame(frame(0));
    link.registered = false;
    source.reachabilityChanged();
    source.frame(frame(1));
    source.remoteStatus({ ...receiving, framesRejected: 9 });
    expect(frames.map((f) => f.t)).toEqual([0]);
    expect(source.getStatus()).toMatchObject({ state: 'error', framesOk: 1, framesRejected: 1 });
  });
});
