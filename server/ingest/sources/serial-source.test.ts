import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { SerialSourceConfigSchema, type BenchStatus } from '../../../shared/schemas/bench.js';
import type { Frame } from '../../../shared/schemas/frame.js';
import { ManualClock } from '../testing/manual-clock.js';
import { mockBinding, mockPortFactory, settle } from '../testing/mock-ports.js';
import { RECONNECT_DELAYS_MS, SerialSource, STALE_PERIODS_BEFORE_REOPEN } from './serial-source.js';

const PATH = '/dev/ttyKP0';
const STALE_AFTER_S = 5;
const config = SerialSourceConfigSchema.parse({
  kind: 'serial',
  path: PATH,
  baudRate: 9600,
  staleAfterSeconds: STALE_AFTER_S,
  format: { kind: 'csv', columns: ['t', 'volts', 'amps'] },
});

function setup() {
  const clock = new ManualClock();
  const { factory, ports } = mockPortFactory();
  const frames: Frame[] = [];
  const statuses: BenchStatus[] = [];
  const source = new SerialSource(config, { frame: (f) => frames.push(f), status: (s) => statuses.push(s) }, { clock, openPort: factory });
  return { clock, ports, frames, statuses, source };
}

const lastPort = (ports: ReturnType<typeof setup>['ports']) => ports[ports.length - 1]!;

describe('SerialSource', () => {
  beforeEach(() => mockBinding.createPort(PATH, { echo: false, record: true }));
  afterEach(() => mockBinding.reset());

  it('opens, parses lines into frames in order and counts bad lines', async () => {
    const { ports, frames, source } = setup();
    source.start();
    await settle();
    expect(source.getStatus().state).toBe('connected');
    lastPort(ports).port!.emitData('0,13.3,10\n1,13.2,10\nbogus\n2,13.1');
    lastPort(ports).port!.emitData(',10\n');
    await settle();
    expect(frames.map((f) => f.t)).toEqual([0, 1, 2]);
    expect(source.getStatus()).toMatchObject({ state: 'receiving', framesOk: 3, framesRejected: 1 });
    await source.stop();
    expect(source.getStatus().state).toBe('idle');
  });

  it('checks every frame where it is made: a frame FrameSchema refuses is counted as bad and never handed on', async () => {
    const jsonl = SerialSourceConfigSchema.parse({ ...config, format: { kind: 'jsonl' } });
    const clock = new ManualClock();
    const { factory, ports } = mockPortFactory();
    const frames: Frame[] = [];
    const source = new SerialSource(jsonl, { frame: (f) => frames.push(f), status: () => undefined }, { clock, openPort: factory });
    source.start();
    await settle();
    // 2^53 + 1 reads as 2^53: an integer, but no longer an exact count (beyond Number.MAX_SAFE_INTEGER, ECMA-262).
    lastPort(ports).port!.emitData('{"t":0,"volts":13.3,"amps":10,"seq":9007199254740993}\n{"t":1,"volts":13.2,"amps":10,"seq":1}\n');
    await settle();
    expect(frames.map((f) => f.t)).toEqual([1]);
    expect(source.getStatus()).toMatchObject({ framesOk: 1, framesRejected: 1, lastRejection: 'bad frame: seq is not a count' });
    await source.stop();
  });

  it('goes stale after staleAfterSeconds without a valid frame and recovers on the next one', async () => {
    const { clock, ports, source, statuses } = setup();
    source.start();
    await settle();
    lastPort(ports).port!.emitData('0,13.3,10\n');
    await settle();
    clock.advance(STALE_AFTER_S * 1000 - 1);
    expect(source.getStatus().state).toBe('receiving');
    // Garbage keeps arriving but is not a valid frame, so it must not feed the watchdog.
    lastPort(ports).port!.emitData('noise\n');
    await settle();
    clock.advance(1);
    expect(source.getStatus()).toMatchObject({ state: 'stale', message: `no valid frame for ${STALE_AFTER_S} s` });
    expect(statuses.map((s) => s.state)).toContain('stale');
    lastPort(ports).port!.emitData('1,13.2,10\n');
    await settle();
    expect(source.getStatus().state).toBe('receiving');
    await source.stop();
  });

  it('reopens with growing back-off while the device is missing, then reconnects by itself', async () => {
    const { clock, ports, frames, source } = setup();
    mockBinding.reset(); // unplugged before start
    source.start();
    await settle();
    expect(source.getStatus().state).toBe('reconnecting');
    expect(ports).toHaveLength(1);
    for (let i = 0; i < 3; i++) {
      const delayMs = RECONNECT_DELAYS_MS[i]!;
      clock.advance(delayMs - 1);
      await settle();
      expect(ports).toHaveLength(i + 1); // not yet
      clock.advance(1);
      await settle();
      expect(ports).toHaveLength(i + 2);
      expect(source.getStatus().state).toBe('reconnecting');
    }
    expect(source.getStatus().message).toMatch(/retrying in 2 s$/);
    mockBinding.createPort(PATH, { echo: false, record: true }); // replug
    clock.advance(RECONNECT_DELAYS_MS[3]);
    await settle();
    expect(source.getStatus().state).toBe('connected');
    lastPort(ports).port!.emitData('5,13.0,10\n');
    await settle();
    expect(frames.map((f) => f.t)).toEqual([5]);
    await source.stop();
  });

  it('reconnects after the open port closes underneath it, and back-off restarts after a good frame', async () => {
    const { clock, ports, frames, source } = setup();
    source.start();
    await settle();
    lastPort(ports).port!.emitData('0,13.3,10\n');
    await settle();
    // The device goes away while open: the port closes and the path is gone.
    mockBinding.reset();
    lastPort(ports).close();
    await settle();
    expect(source.getStatus().state).toBe('reconnecting');
    clock.advance(RECONNECT_DELAYS_MS[0]);
    await settle();
    expect(source.getStatus().message).toMatch(/retrying in 0.50 s$/);
    mockBinding.createPort(PATH, { echo: false, record: true });
    clock.advance(RECONNECT_DELAYS_MS[1]);
    await settle();
    lastPort(ports).port!.emitData('1,13.2,10\n');
    await settle();
    expect(frames.map((f) => f.t)).toEqual([0, 1]);
    lastPort(ports).close();
    await settle();
    // A valid frame came through, so the next wait starts again from the first step.
    expect(source.getStatus().message).toMatch(/retrying in 0.25 s$/);
    await source.stop();
    expect(clock.pendingCount()).toBe(0);
  });

  it('never delivers a frame to a throwing sink twice nor stops on it', async () => {
    const clock = new ManualClock();
    const { factory, ports } = mockPortFactory();
    let calls = 0;
    const source = new SerialSource(
      config,
      { frame: () => { calls++; throw new Error('consumer broke'); }, status: () => { throw new Error('also broke'); } },
      { clock, openPort: factory },
    );
    source.start();
    await settle();
    lastPort(ports).port!.emitData('0,1,1\n1,1,1\n');
    await settle();
    expect(calls).toBe(2);
    expect(source.getStatus().framesOk).toBe(2);
    await source.stop();
  });
});

describe('SerialSource stale reopen', () => {
  beforeEach(() => mockBinding.createPort(PATH, { echo: false, record: true }));
  afterEach(() => mockBinding.reset());

  it('reopens a port that stays stale, as after a USB reset that leaves it open but dead', async () => {
    const { clock, ports, frames, source } = setup();
    source.start();
    await settle();
    lastPort(ports).port!.emitData('0,13.3,10\n');
    await settle();
    clock.advance(STALE_AFTER_S * 1000);
    expect(source.getStatus().state).toBe('stale');
    clock.advance(STALE_AFTER_S * 1000 * STALE_PERIODS_BEFORE_REOPEN - 1);
    await settle();
    expect(ports).toHaveLength(1); // still waiting
    clock.advance(1);
    await settle();
    expect(source.getStatus()).toMatchObject({ state: 'reconnecting' });
    expect(source.getStatus().message).toMatch(/^no valid frame for a long while: reopening the port/);
    expect(ports[0]!.isOpen).toBe(false);
    clock.advance(RECONNECT_DELAYS_MS[1]);
    await settle();
    expect(ports).toHaveLength(2);
    lastPort(ports).port!.emitData('1,13.2,10\n');
    await settle();
    expect(frames.map((f) => f.t)).toEqual([0, 1]);
    await source.stop();
  });

  it('does not reopen when frames come back before the reopen is due', async () => {
    const { clock, ports, source } = setup();
    source.start();
    await settle();
    clock.advance(STALE_AFTER_S * 1000);
    expect(source.getStatus().state).toBe('stale');
    lastPort(ports).port!.emitData('0,13.3,10\n');
    await settle();
    clock.advance(STALE_AFTER_S * 1000 * STALE_PERIODS_BEFORE_REOPEN);
    await settle();
    expect(ports).toHaveLength(1);
    await source.stop();
  });
});
