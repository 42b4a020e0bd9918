import { z } from 'zod';
import { RunTotalsSchema } from './reading.js';
import { ChemistrySchema } from './chemistry.js';
import { CutoffCauseSchema } from './run-event.js';

const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/** Where a run's gap limit came from: typed on the run or import, the source's cadence × factor, or the 30 s default. */
export const GapLimitBasisSchema = z.enum(['explicit', 'cadence', 'default']);

/** Pass/fail against the acceptance %, or `unrated` when no rating was given. */
export const VerdictSchema = z.enum(['pass', 'fail', 'unrated']);
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
    /** The gap limit in force, s, and where it came from (absent in summaries stored before it was kept). */
    maxGapSeconds: nonNeg.nullable().default(null),
    gapLimitBasis: GapLimitBasisSchema.nullable().default(null),
    /** The source's cadence the limit was derived from, s (null when typed or defaulted). */
    cadenceSeconds: nonNeg.nullable().default(null),
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
  })
  .extend(RunTotalsSchema.shape);

export type RunSummary = z.infer<typeof RunSummarySchema>;
