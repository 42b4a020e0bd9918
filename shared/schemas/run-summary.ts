import { z } from 'zod';
import { RunTotalsSchema } from './reading.js';
import { ChemistrySchema } from './chemistry.js';
import { CutoffCauseSchema } from './run-event.js';
import { ProtectionResultSchema } from './protection-check.js';

const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/**
 * Pass/fail against the acceptance %, `unrated` when no rating was given, `not-applicable` on a
 * run that is not a capacity test (a protection check is judged by its per-protection table).
 */
export const VerdictSchema = z.enum(['pass', 'fail', 'unrated', 'not-applicable']);
export type Verdict = z.infer<typeof VerdictSchema>;

/**
 * The figures of one finished (or stopped) run. Null means "not known for this run"
 * (no rating, no price, no mass, no load step, ...), never zero.
 */
export const RunSummarySchema = z
  .object({
    durationSeconds: nonNeg,
    readings: z.number().int().nonnegative(),
    /** Frames refused by the integrator (non-finite, backwards, duplicate). */
    rejectedReadings: z.number().int().nonnegative(),
    gaps: z.number().int().nonnegative(),
    gapSeconds: nonNeg,
    /** Time-weighted means while under load (discharge amps ≥ the run's loadOnAmps). */
    meanVolts: finite.nullable(),
    meanAmps: finite.nullable(),
    meanWatts: finite.nullable(),
    minVolts: finite.nullable(),
    maxVolts: finite.nullable(),
    minTempCelsius: finite.nullable(),
    maxTempCelsius: finite.nullable(),
    chemistry: ChemistrySchema.nullable(),
    cellsInSeries: z.number().int().positive().nullable(),
    nominalVolts: finite.nullable(),
    ratedAh: finite.nullable(),
    ratedWh: finite.nullable(),
    percentRatedAh: finite.nullable(),
    percentRatedWh: finite.nullable(),
    acceptancePercent: finite,
    verdict: VerdictSchema,
    cutoffCause: CutoffCauseSchema.nullable(),
    cutoffVolts: finite.nullable(),
    recoverySeconds: nonNeg.nullable(),
    /** Mean discharge amps ÷ rated Ah. */
    cRate: finite.nullable(),
    costPerKWh: finite.nullable(),
    whPerKg: finite.nullable(),
    /** Discharge Wh ÷ charge Wh when both halves are in the run. */
    roundTripEfficiency: finite.nullable(),
    internalResistanceOhms: finite.nullable(),
    /** Lead-acid only: capacity corrected to 25 °C (IEEE 450 method). */
    correctedAh25C: finite.nullable(),
    /** Lowest and highest reading of each temperature channel, by the bench's channel name. */
    tempChannels: z.record(z.string(), z.object({ minCelsius: finite, maxCelsius: finite })).optional(),
    /** Protection checks only: one row per protection checked (see ProtectionResult). */
    protections: z.array(ProtectionResultSchema).optional(),
  })
  .extend(RunTotalsSchema.shape);

export type RunSummary = z.infer<typeof RunSummarySchema>;
