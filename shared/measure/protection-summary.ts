import type { RunEvent } from '../schemas/run-event.js';
import type { RunKind } from '../schemas/run.js';
import type { RunSummary } from '../schemas/run-summary.js';
import { PROTECTION_TRAITS, type ProtectionExpectation } from '../schemas/protection-check.js';
import type { RunStats } from './run-stats.js';
import type { RunPipelineSnapshot } from './run-pipeline.js';
import { protectionResults } from './protection-results.js';

/** Whether the run's readings ever got past a check's threshold, from the run's extremes (null: no such signal recorded). */
export function reachedFrom(stats: RunStats): (p: ProtectionExpectation) => boolean | null {
  return (p) => {
    const traits = PROTECTION_TRAITS[p.protection];
    let low: number | null = null;
    let high: number | null = null;
    if (traits.signal === 'volts') [low, high] = [stats.minVolts, stats.maxVolts];
    else if (traits.signal === 'amps') [low, high] = [stats.minAmps ?? null, stats.maxAmps ?? null];
    else {
      const channels = stats.tempChannels ?? {};
      const channel = p.channel !== null ? channels[p.channel] : Object.values(channels)[0];
      if (channel) [low, high] = [channel.min, channel.max];
    }
    if (low === null || high === null) return null;
    return traits.direction === 'below' ? low < p.thresholdValue : high > p.thresholdValue;
  };
}

/**
 * Adds what every run page shows beside the core figures: each temperature channel's lowest
 * and highest reading by its bench label and, on a protection check, the per-protection
 * table in place of a capacity verdict (no % of rated, verdict `not-applicable`).
 */
export function withRunDetails(summary: RunSummary, snapshot: RunPipelineSnapshot, events: readonly RunEvent[], kind: RunKind): RunSummary {
  const tempChannels = Object.fromEntries(
    Object.entries(snapshot.stats.tempChannels ?? {}).map(([name, c]) => [name, { minCelsius: c.min, maxCelsius: c.max }]),
  );
  const out: RunSummary = { ...summary, tempChannels };
  if (kind !== 'protection-check') return out;
  return {
    ...out,
    verdict: 'not-applicable',
    percentRatedAh: null,
    percentRatedWh: null,
    protections: protectionResults(snapshot.config.protectionChecks, events, reachedFrom(snapshot.stats)),
  };
}
