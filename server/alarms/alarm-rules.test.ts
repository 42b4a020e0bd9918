import { describe, expect, it } from 'vitest';
import { alarmActionFor, alarmState, lastEscalationStep } from './alarm-rules.js';
import { retryDelayMs } from '../queue/retry-policy.js';

describe('alarm rules', () => {
  it('maps the run\'s events to alarm kinds', () => {
    expect(alarmActionFor({ type: 'cutoff', elapsedSeconds: 1, cause: 'end-voltage', volts: 12, amps: 10, dischargeWh: 1, dischargeAh: 1 })).toMatchObject({ type: 'raise', kind: 'cutoff' });
    expect(alarmActionFor({ type: 'cutoff', elapsedSeconds: 1, cause: 'protection', signal: 'voltage-collapse', volts: 2, amps: 10, dischargeWh: 1, dischargeAh: 1 })).toMatchObject({ type: 'raise', kind: 'protection-trip' });
    expect(alarmActionFor({ type: 'alarm', elapsedSeconds: 1, level: 'warning', code: 'over-temperature', message: 'hot' })).toMatchObject({ type: 'raise', kind: 'over-temperature' });
    expect(alarmActionFor({ type: 'milestone', elapsedSeconds: 1, milestone: 'near-end-voltage', volts: 12.1, dischargeWh: 1, dischargeAh: 1 })).toMatchObject({ type: 'raise', kind: 'near-end' });
    expect(alarmActionFor({ type: 'source-restored', elapsedSeconds: 1 })).toEqual({ type: 'clear', kind: 'source-lost' });
    // A programme failing safe calls a person; its other step changes do not.
    expect(alarmActionFor({ type: 'programme-step', elapsedSeconds: 5, phase: 'fail', index: 2, label: 'Discharge 20 A to 11.2 V', reason: 'meter silent for 2 s' }))
      .toEqual({ type: 'raise', kind: 'programme-failed', message: 'Programme failed safe at step 3 (Discharge 20 A to 11.2 V): meter silent for 2 s. Outputs switched off.' });
    // An output that could not be confirmed off must not be reported as switched off: a person checks the bench.
    expect(alarmActionFor({ type: 'programme-step', elapsedSeconds: 5, phase: 'fail', index: 0, label: 'Charge', reason: 'the server stopped while the programme ran', outputsConfirmedOff: false }))
      .toEqual({ type: 'raise', kind: 'programme-failed', message: 'Programme failed at step 1 (Charge): the server stopped while the programme ran. Not every output could be confirmed off: check the bench by hand.' });
    expect(alarmActionFor({ type: 'programme-step', elapsedSeconds: 5, phase: 'end', index: 2, label: 'Discharge' })).toBeNull();
    expect(alarmActionFor({ type: 'programme-step', elapsedSeconds: 5, phase: 'abort', index: 2, label: 'Discharge', reason: 'aborted by a technician' })).toBeNull();
    // A reconnect after a cutoff clears nothing: the cutoff alarm latches until acknowledged.
    expect(alarmActionFor({ type: 'recovery', elapsedSeconds: 2, cutoffElapsedSeconds: 1, recoverySeconds: 1, volts: 13 })).toBeNull();
  });

  it('names the four lifecycle states of ISA-18.2 (unacknowledged, acknowledged, return to normal unacknowledged, normal)', () => {
    expect(alarmState(false, false)).toBe('unacknowledged');
    expect(alarmState(true, false)).toBe('acknowledged');
    expect(alarmState(false, true)).toBe('cleared-unacknowledged');
    expect(alarmState(true, true)).toBe('cleared');
  });

  it('doubles the retry wait from the first up to the cap (exponential back-off, common practice)', () => {
    expect([1, 2, 3, 4, 5, 6, 7].map((n) => retryDelayMs(n, 5000, 300_000))).toEqual([5000, 10_000, 20_000, 40_000, 80_000, 160_000, 300_000]);
    // SMTP away 5 minutes with the default back-off: the sum of waits passes 300 s at the 7th attempt,
    // so the mail goes out within one capped wait (5 min) of the server's return.
    const waits = [1, 2, 3, 4, 5, 6].map((n) => retryDelayMs(n, 5000, 300_000));
    expect(waits.reduce((a, b) => a + b, 0)).toBe(315_000);
  });

  it('escalates at least once, then once per further on-call person', () => {
    expect(lastEscalationStep(0)).toBe(1);
    expect(lastEscalationStep(1)).toBe(1);
    expect(lastEscalationStep(3)).toBe(3);
  });
});
