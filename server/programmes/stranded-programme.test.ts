import { describe, expect, it } from 'vitest';
import type { BenchInstrumentsProvider } from '../control/bench-instruments.js';
import { FakeInstrument } from '../control/testing/fake-instrument.js';
import { strandedFailEvent, switchOffStranded } from './stranded-programme.js';

const now = () => 0;
const onBench = (load: FakeInstrument, supply: FakeInstrument): BenchInstrumentsProvider => ({ forBench: async () => ({ load, supply }) });

describe('a programme stranded by a server stop', () => {
  it('switches both outputs off and counts them off only once each reads back off', async () => {
    const load = new FakeInstrument('load-1', 'load', now, false);
    const supply = new FakeInstrument('supply-1', 'supply', now, false);
    load.outputOn = true;
    const outcome = await switchOffStranded(onBench(load, supply), 3);
    expect(load.outputOn).toBe(false);
    expect(load.calls).toEqual(['output off', 'read?']);
    expect(supply.calls).toEqual(['output off', 'read?']);
    expect(outcome).toEqual({ confirmedOff: true, reason: 'the server stopped while the programme ran; at restart load-1: output confirmed off; supply-1: output confirmed off' });
  });

  it('an instrument that does not answer is named as not confirmed off; the other is still switched off', async () => {
    const load = new FakeInstrument('load-1', 'load', now, false);
    const supply = new FakeInstrument('supply-1', 'supply', now, false);
    supply.outputOn = true;
    load.behaviour = 'silent';
    const outcome = await switchOffStranded(onBench(load, supply), 3);
    expect(supply.outputOn).toBe(false);
    expect(outcome.confirmedOff).toBe(false);
    expect(outcome.reason).toBe('the server stopped while the programme ran; at restart load-1: output off not confirmed (load-1: no reply to output off within the timeout); supply-1: output confirmed off');
  });

  it('a bench whose instruments cannot be opened, or that has none, never throws and is not confirmed off', async () => {
    const failing: BenchInstrumentsProvider = { forBench: async () => Promise.reject(new Error('cannot open /dev/ttyUSB7')) };
    expect(await switchOffStranded(failing, 3)).toEqual({ confirmedOff: false, reason: "the server stopped while the programme ran; at restart the bench's instruments could not be reached (cannot open /dev/ttyUSB7), outputs not confirmed off" });
    expect((await switchOffStranded({ forBench: async () => null }, 3)).confirmedOff).toBe(false);
    expect((await switchOffStranded(undefined, 3)).confirmedOff).toBe(false);
    expect((await switchOffStranded(onBench(new FakeInstrument('l', 'load', now), new FakeInstrument('s', 'supply', now)), null)).confirmedOff).toBe(false);
  });

  it('the fail event names the step that was running and whether the outputs were confirmed off', () => {
    const stored = { currentIndex: 1, stepLabels: ['Charge to 14.4 V', 'Discharge 5 A to 11.6 V'] } as Parameters<typeof strandedFailEvent>[0];
    expect(strandedFailEvent(stored, 812.5, { confirmedOff: false, reason: 'r' }))
      .toEqual({ type: 'programme-step', elapsedSeconds: 812.5, phase: 'fail', index: 1, label: 'Discharge 5 A to 11.6 V', reason: 'r', outputsConfirmedOff: false });
  });
});
