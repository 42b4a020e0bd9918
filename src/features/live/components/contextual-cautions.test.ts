import { describe, expect, it } from 'vitest';
import { contextualCautions } from './contextual-cautions';

// Common practice (cell makers' datasheets): lithium cells must not be charged below 0 °C.
describe('contextual cautions', () => {
  it('warns loudly about charging a cold lithium pack', () => {
    const cautions = contextualCautions('lfp', 'charge', -4.5);
    expect(cautions[0].severe).toBe(true);
    expect(cautions[0].text).toContain('-4.5 °C');
  });

  it('only reminds when the lithium pack is warm enough or not charging', () => {
    expect(contextualCautions('lfp', 'charge', 18).some((c) => c.severe)).toBe(false);
    expect(contextualCautions('nmc', 'capacity-discharge', -10).some((c) => c.severe)).toBe(false);
  });

  it('names hydrogen for lead-acid and not for lithium', () => {
    expect(contextualCautions('lead-acid', 'charge', 20).map((c) => c.text).join(' ')).toMatch(/hydrogen/);
    expect(contextualCautions('lfp', 'charge', 20).map((c) => c.text).join(' ')).not.toMatch(/hydrogen/);
  });

  it('speaks the lab\'s unit: °F when the lab chose it', () => {
    // −4.5 °C = 23.9 °F and 0 °C = 32 °F (°F = °C × 9/5 + 32, the Fahrenheit definition).
    const cold = contextualCautions('lfp', 'charge', -4.5, 'F');
    expect(cold[0].text).toContain('23.9 °F');
    expect(cold[0].text).toContain('below 32 °F');
    expect(contextualCautions('lfp', 'charge', 18, 'F')[0].text).toContain('above 32 °F');
  });

  it('tells the technician to stay with a protection check and be ready to cut power by hand', () => {
    expect(contextualCautions('lfp', 'protection-check', 20).map((c) => c.text).join(' ')).toMatch(/past its limits.*cut the charger and load by hand/);
    expect(contextualCautions('lfp', 'capacity-discharge', 20).map((c) => c.text).join(' ')).not.toMatch(/past its limits/);
  });
});
