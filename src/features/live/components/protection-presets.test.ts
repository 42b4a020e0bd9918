import { describe, expect, it } from 'vitest';
import type { ProtectionSpec } from '../../../../shared/schemas/protection-check';
import { emptyChoices, protectionRequestsFrom } from './protection-presets';

const spec = (over: Partial<ProtectionSpec> & Pick<ProtectionSpec, 'protection' | 'thresholdValue'>): ProtectionSpec => ({
  delaySeconds: null, releaseValue: null, thresholdTolerance: null, delayToleranceSeconds: null, ...over,
});

describe('protectionRequestsFrom', () => {
  it('turns ticked rows into protections: temperatures on the channel in °C, volts and amps as typed', () => {
    const c = emptyChoices();
    c['cold-charge'] = { on: true, threshold: '0', delay: '5' };
    c['low-voltage'] = { on: true, threshold: '40', delay: '2' };
    expect(protectionRequestsFrom(c, 'C', 'cell', [])).toEqual({
      ok: true,
      checks: [
        { protection: 'cold-charge', thresholdValue: 0, delaySeconds: 5, channel: 'cell' },
        { protection: 'low-voltage', thresholdValue: 40, delaySeconds: 2, channel: null },
      ],
    });
  });

  it('reads temperatures typed in °F in a °F lab', () => {
    const c = emptyChoices();
    c['over-temp-charge'] = { on: true, threshold: '140', delay: '' };
    // 140 °F = 60 °C (°C = (°F − 32) × 5/9, the Fahrenheit definition).
    const out = protectionRequestsFrom(c, 'F', 'cell', []);
    expect(out.ok && out.checks[0]!.thresholdValue).toBeCloseTo(60, 9);
  });

  it('refuses a hot limit typed without ticking its box, instead of ignoring it', () => {
    // Issue 11 item 7: a typed hot limit with its box unticked was silently dropped.
    const c = emptyChoices();
    c['cold-charge'] = { on: true, threshold: '', delay: '' };
    c['over-temp-discharge'] = { on: false, threshold: '60', delay: '' };
    const out = protectionRequestsFrom(c, 'C', 'cell', []);
    expect(out.ok).toBe(false);
    expect(!out.ok && out.errors['over-temp-discharge']).toMatch(/Tick the box/);
  });

  it('leaves an empty threshold to the pack\'s record, else to common practice, else refuses', () => {
    const c = emptyChoices();
    c['cold-charge'] = { on: true, threshold: '', delay: '' };
    c['heater-off'] = { on: true, threshold: '', delay: '' };
    c['over-current'] = { on: true, threshold: '', delay: '' };
    // Common practice (no source): charge refused near 0 °C, heaters off near 5 °C.
    const withRecord = protectionRequestsFrom(c, 'C', 'cell', [spec({ protection: 'over-current', thresholdValue: 60 })]);
    expect(withRecord).toEqual({
      ok: true,
      checks: [
        { protection: 'cold-charge', thresholdValue: 0, channel: 'cell' },
        { protection: 'heater-off', thresholdValue: 5, channel: 'cell' },
        { protection: 'over-current', channel: null },
      ],
    });
    const without = protectionRequestsFrom(c, 'C', 'cell', []);
    expect(!without.ok && without.errors['over-current']).toMatch(/record states none/);
  });

  it('asks for at least one protection', () => {
    expect(protectionRequestsFrom(emptyChoices(), 'C', 'cell', []).ok).toBe(false);
  });
});
