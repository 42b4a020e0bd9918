import { z } from 'zod';

/** Extremes seen over a run, for the summary (plain, serialisable). */
export const RunStatsSchema = z.object({
  minVolts: z.number().nullable(),
  maxVolts: z.number().nullable(),
  minTempCelsius: z.number().nullable(),
  maxTempCelsius: z.number().nullable(),
  lastElapsedSeconds: z.number().nullable(),
});
export type RunStats = z.infer<typeof RunStatsSchema>;

/** Empty stats. */
export function createRunStats(): RunStats {
  return { minVolts: null, maxVolts: null, minTempCelsius: null, maxTempCelsius: null, lastElapsedSeconds: null };
}

/** Folds one accepted reading into the stats (constant work per temperature channel). */
export function updateRunStats(s: RunStats, elapsedSeconds: number, volts: number, temps: Record<string, number> | undefined): void {
  if (s.minVolts === null || volts < s.minVolts) s.minVolts = volts;
  if (s.maxVolts === null || volts > s.maxVolts) s.maxVolts = volts;
  if (temps) {
    for (const key in temps) {
      const c = temps[key]!;
      if (s.minTempCelsius === null || c < s.minTempCelsius) s.minTempCelsius = c;
      if (s.maxTempCelsius === null || c > s.maxTempCelsius) s.maxTempCelsius = c;
    }
  }
  s.lastElapsedSeconds = elapsedSeconds;
}
