import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { BenchSourceConfigSchema, type BenchStatus } from '../../shared/schemas/bench.js';
import type { Frame } from '../../shared/schemas/frame.js';
import { BenchManager } from './bench-manager.js';
import { ManualClock } from './testing/manual-clock.js';
import { mockBinding, mockPortFactory, settle } from './testing/mock-ports.js';

const serial = (path: string, columns = ['t', 'volts', 'amps']) =>
  BenchSourceConfigSchema.parse({ kind: 'serial', path, format: { kind: 'csv', columns } });

function setup() {
  const clock = new ManualClock();
  const { factory, ports } = mockPortFactory();
  const faults: unknown[] = [];
  const manager = new BenchManager({ clock, openPort: factory }, { info: () => undefined, warn: () => undefined, error: (_m, err) => faults.push(err) });
  return { clock, ports, manager, faults };
}

describe('BenchManager', () => {
  beforeEach(() => {
    mockBinding.createPort('/dev/ttyA', { echo: false, record: true });
    mockBinding.createPort('/dev/ttyB', { echo: false, record: true });
  });
  afterEach(() => mockBinding.reset());

  it('fans frames out per bench, isolating a throwing listener from the others', async () => {
    const { ports, manager, faults } = setup();
    const seenA: [number, Frame][] = [];
    const seenB: [number, Frame][] = [];
    manager.onFrame((id, f) => seenA.push([id, f]));
    manager.onFrame(() => {
      throw new Error('archive down');
    });
    manager.onFrame((id, f) => seenB.push([id, f]));
    await manager.sync([
      { id: 1, source: serial('/dev/ttyA'), enabled: true },
      { id: 2, source: serial('/dev/ttyB'), enabled: true },
    ]);
    await settle();
    ports[0]!.port!.emitData('0,13.3,5\n1,13.2,5\n');
    ports[1]!.port!.emitData('7,26.5,2\n');
    await settle();
    expect(seenA.map(([id, f]) => `${id}:${f.t}`)).toEqual(['1:0', '1:1', '2:7']);
    expect(seenB).toEqual(seenA);
    expect(faults).toHaveLength(1); // reported once, not once per frame
    expect(manager.getStatus(1)).toMatchObject({ state: 'receiving', framesOk: 2 });
    await manager.stopAll();
  });

  it('keeps an unchanged bench running, restarts a changed one and stops removed ones', async () => {
    const { ports, manager } = setup();
    const statuses: [number, BenchStatus][] = [];
    manager.onStatus((id, s) => statuses.push([id, s]));
    await manager.apply({ id: 1, source: serial('/dev/ttyA'), enabled: true });
    await settle();
    await manager.apply({ id: 1, source: serial('/dev/ttyA'), enabled: true });
    expect(ports).toHaveLength(1);
    await manager.apply({ id: 1, source: serial('/dev/ttyA', ['volts', 'amps']), enabled: true });
    await settle();
    expect(ports).toHaveLength(2);
    expect(ports[0]!.isOpen).toBe(false);
    await manager.apply({ id: 1, source: serial('/dev/ttyA'), enabled: false });
    expect(manager.getStatus(1)).toMatchObject({ state: 'idle', message: 'bench disabled' });
    await manager.sync([]);
    expect(manager.benchIds()).toEqual([]);
    expect(statuses.some(([id, s]) => id === 1 && s.state === 'connected')).toBe(true);
  });

  it('restart closes and reopens the port', async () => {
    const { ports, manager } = setup();
    await manager.apply({ id: 3, source: serial('/dev/ttyA'), enabled: true });
    await settle();
    expect(await manager.restart(3)).toBe(true);
    await settle();
    expect(ports).toHaveLength(2);
    expect(ports[0]!.isOpen).toBe(false);
    expect(manager.getStatus(3).state).toBe('connected');
    expect(await manager.restart(99)).toBe(false);
    await manager.stopAll();
  });

  it('a "none" source is idle and an unmanaged bench reports not running', async () => {
    const { manager } = setup();
    await manager.apply({ id: 4, source: { kind: 'none' }, enabled: true });
    expect(manager.getStatus(4)).toMatchObject({ state: 'idle', message: 'no source configured' });
    expect(manager.getStatus(5)).toMatchObject({ state: 'idle', message: 'bench not running' });
  });
});

describe('BenchManager concurrency', () => {
  beforeEach(() => mockBinding.createPort('/dev/ttyA', { echo: false, record: true }));
  afterEach(() => mockBinding.reset());

  it('applies quick successive changes to one bench one at a time, leaving one open port', async () => {
    const { ports, manager } = setup();
    await Promise.all([
      manager.apply({ id: 1, source: serial('/dev/ttyA'), enabled: true }),
      manager.apply({ id: 1, source: serial('/dev/ttyA', ['volts', 'amps']), enabled: true }),
      manager.apply({ id: 1, source: serial('/dev/ttyA', ['amps', 'volts']), enabled: true }),
    ]);
    await settle();
    expect(ports).toHaveLength(3);
    expect(ports.filter((p) => p.isOpen)).toHaveLength(1);
    expect(ports[2]!.isOpen).toBe(true);
    await manager.stopAll();
    expect(ports.filter((p) => p.isOpen)).toHaveLength(0);
  });

  it('puts a fresh simulated pack on a simulated bench (its scenario from the start), and leaves a real meter alone', async () => {
    const { clock, manager } = setup();
    const frames: Frame[] = [];
    manager.onFrame((id, f) => {
      if (id === 3) frames.push(f);
    });
    const simulated = BenchSourceConfigSchema.parse({ kind: 'simulator', scenario: 'lfp-12v-100ah-cp-cutoff', speed: 10, seed: 7 });
    await manager.apply({ id: 3, source: simulated, enabled: true });
    await manager.apply({ id: 1, source: serial('/dev/ttyA'), enabled: true });
    clock.advance(3000);
    const lastBefore = frames[frames.length - 1]!.t;
    expect(lastBefore).toBeGreaterThanOrEqual(29);
    frames.length = 0;
    expect(await manager.freshSimulation(3)).toBe(true);
    clock.advance(1000);
    // The scenario plays again from its device time 0 with a full pack.
    expect(frames[0]!.t).toBe(0);
    expect(frames[frames.length - 1]!.t).toBeLessThan(lastBefore);
    expect(await manager.freshSimulation(1)).toBe(false);
    expect(await manager.freshSimulation(99)).toBe(false);
    await manager.stopAll();
  });
});
