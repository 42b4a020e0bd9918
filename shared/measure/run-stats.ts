import { z } from 'zod';

const nullableNumber = z.number().nullable();

/**
 * Extremes and under-load integrals over a run, for the summary (plain, serialisable).
 * "Under load" = discharge current ≥ the run's loadOnAmps at both ends of a panel, so rest
 * periods and meter noise around 0 A do not dilute the mean volts, amps and watts.
 */
export const RunStatsSchema = z.object({
  minVolts: nullableNumber,
  maxVolts: nullableNumber,
  minTempCelsius: nullableNumber,
  maxTempCelsius: nullableNumber,
  lastElapsedSeconds: nullableNumber,
  loadSeconds: z.number(),
  loadVoltSeconds: z.number(),
  loadAmpSeconds: z.number(),
  loadWattSeconds: z.number(),
  lastLoadT: nullableNumber,
  lastLoadVolts: z.number(),
  lastLoadAmps: z.number(),
  /** Extremes of each temperature channel, by the bench's channel name (absent in older snapshots). */
  tempChannels: z.record(z.string(), z.object({ min: z.number(), max: z.number() })).default({}),
  minAmps: nullableNumber.default(null),
  maxAmps: nullableNumber.default(null),
});
export type RunStats = z.infer<typeof RunStatsSchema>;

/** Empty stats. */
export function createRunStats(): RunStats {
  return {
    minVolts: null, maxVolts: null, minTempCelsius: null, maxTempCelsius: null, lastElapsedSeconds: null,
    loadSeconds: 0, loadVoltSeconds: 0, loadAmpSeconds: 0, loadWattSeconds: 0, lastLoadT: null, lastLoadVolts: 0, lastLoadAmps: 0,
    tempChannels: {}, minAmps: null, maxAmps: null,
  };
}

/** Folds one accepted reading into the stats (constant work per temperature channel). `gap` breaks the load panel. */
export function updateRunStats(s: RunStats, elapsedSeconds: number, volts: number, amps: number, temps: Record<string, number> | undefined, loadOnAmps: number, gap: boolean): void {
  if (s.minVolts === null || volts < s.minVolts) s.minVolts = volts;
  if (s.maxVolts === null || volts > s.maxVolts) s.maxVolts = volts;
  s.tempChannels ??= {};
  if (s.minAmps === undefined || s.minAmps === null || amps < s.minAmps) s.minAmps = amps;
  if (s.maxAmps === undefined || s.maxAmps === null || amps > s.maxAmps) s.maxAmps = amps;
  if (temps) {
    for (const key in temps) {
      const c = temps[key]!;
      if (s.minTempCelsius === null || c < s.minTempCelsius) s.minTempCelsius = c;
      if (s.maxTempCelsius === null || c > s.maxTempCelsius) s.maxTempCelsius = c;
      const channel = s.tempChannels[key];
      if (!channel) s.tempChannels[key] = { min: c, max: c };
      else {
        if (c < channel.min) channel.min = c;
        if (c > channel.max) channel.max = c;
      }
    }
  }
  s.lastElapsedSeconds = elapsedSeconds;
  const underLoad = amps >= loadOnAmps;
  if (underLoad && s.lastLoadT !== null && !gap) {
    const dt = elapsedSeconds - s.lastLoadT;
    s.loadSeconds += dt;
    s.loadVoltSeconds += ((s.lastLoadVolts + volts) / 2) * dt;
    s.loadAmpSeconds += ((s.lastLoadAmps + amps) / 2) * dt;
    s.loadWattSeconds += ((s.lastLoadVolts * s.lastLoadAmps + volts * amps) / 2) * dt;
  }
  s.lastLoadT = underLoad ? elapsedSeconds : null;
  s.lastLoadVolts = volts;
  s.lastLoadAmps = amps;
}

/** Time-weighted means under load (null when the run never had a load). */
export function meansUnderLoad(s: RunStats): { meanVolts: number | null; meanAmps: number | null; meanWatts: number | null } {
  if (!(s.loadSeconds > 0)) return { meanVolts: null, meanAmps: null, meanWatts: null };
  return { meanVolts: s.loadVoltSeconds / s.loadSeconds, meanAmps: s.loadAmpSeconds / s.loadSeconds, meanWatts: s.loadWattSeconds / s.loadSeconds };
}
