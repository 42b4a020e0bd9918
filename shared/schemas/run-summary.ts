import { z } from 'zod';
import { RunTotalsSchema } from './reading.js';
import { ChemistrySchema } from './chemistry.js';
import { CutoffCauseSchema, ProtectionSignalSchema } from './run-event.js';
import { ProtectionResultSchema } from './protection-check.js';
import { CapacityUncertaintySchema } from './meter-accuracy.js';

const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/** Where a run's gap limit came from: typed on the run or import, the source's cadence × factor, or the 30 s default. */
export const GapLimitBasisSchema = z.enum(['explicit', 'cadence', 'default']);

/**
 * Pass/fail against the acceptance %; `unrated` when no rating was given; `incomplete` when
 * the run did not measure a capacity (see `capacityEndedBy`); `not-applicable` on a run that
 * is not a capacity test (a protection check is judged by its per-protection table);
 * `borderline` when the margin between the capacity and the acceptance threshold lies
 * inside the capacity's expanded uncertainty (k = 2) from the bench meter's accuracy.
 */
export const VerdictSchema = z.enum(['pass', 'fail', 'borderline', 'unrated', 'incomplete', 'not-applicable']);

/**
 * What ended the measured capacity: the end voltage, the pack's protection (a trip that did
 * not reconnect, or any trip when the run says a trip ends the test), or the end of a run with
 * no end voltage. Incomplete: the pack started below the end voltage, the run was stopped
 * before reaching it, it is still recording, or it had no discharge.
 */
export const CapacityEndedBySchema = z.enum([
  'end-voltage', 'protection', 'run-end', 'started-below-end-voltage', 'stopped-before-end-voltage', 'in-progress', 'no-discharge',
]);
export type CapacityEndedBy = z.infer<typeof CapacityEndedBySchema>;

/** One protection trip during a run: where it opened, and how long until it reconnected (null: it did not). */
export const ProtectionTripSchema = z.object({
  /** Run time of the trip, s. */
  elapsedSeconds: finite,
  volts: finite,
  amps: finite,
  dischargeAh: nonNeg,
  dischargeWh: nonNeg,
  signal: ProtectionSignalSchema,
  recoverySeconds: nonNeg.nullable(),
});
export type ProtectionTrip = z.infer<typeof ProtectionTripSchema>;
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
    /** Capacity to the end voltage (or to the protection that ended the test): the figure the verdict uses. */
    capacityAh: nonNeg.nullable().default(null),
    capacityWh: nonNeg.nullable().default(null),
    capacityEndedBy: CapacityEndedBySchema.nullable().default(null),
    /** Run time at which the capacity ends (the interpolated end-voltage crossing or the trip), s. */
    capacityEndSeconds: finite.nullable().default(null),
    /** Protection trips on the way (at most 100 listed; `protectionTripCount` counts them all). */
    protectionTrips: z.array(ProtectionTripSchema).default([]),
    protectionTripCount: z.number().int().nonnegative().default(0),
    /** The load threshold in force, A: discharge current at or above it counts as a load. */
    loadOnAmps: finite.nullable().default(null),
    /** capacityAh (or Wh) as % of rated; the verdict compares it rounded down to 0.1 %, as shown. */
    percentRatedAh: finite.nullable(),
    percentRatedWh: finite.nullable(),
    acceptancePercent: finite,
    verdict: VerdictSchema,
    /** Uncertainty of capacityAh/Wh from the bench meter's stated accuracy (null: no accuracy stated or no capacity). */
    uncertainty: CapacityUncertaintySchema.nullable().default(null),
    /** Cause and voltage of the cutoff that ended the capacity (null when none did). */
    cutoffCause: CutoffCauseSchema.nullable(),
    cutoffVolts: finite.nullable(),
    /** Reconnect time of the first protection trip. */
    recoverySeconds: nonNeg.nullable(),
    /** Mean discharge amps under load ÷ rated Ah: the test rate. */
    cRate: finite.nullable(),
    /** Temperature range under load (any channel), °C: the test temperature. */
    testMinTempCelsius: finite.nullable().default(null),
    testMaxTempCelsius: finite.nullable().default(null),
    /**
     * Rate or temperature outside what IEC 61960-3 rates capacity at (0.2 C ± 10 %, 20 ± 5 °C;
     * the standard from memory, the rate tolerance ours); null when not known.
     */
    rateOutsideStandard: z.boolean().nullable().default(null),
    tempOutsideStandard: z.boolean().nullable().default(null),
    costPerKWh: finite.nullable(),
    whPerKg: finite.nullable(),
    /**
     * Wh out of the first discharge ÷ Wh in to the full charge after it; null unless
     * `roundTripStatus` is `complete` (`incomplete`: the charge was partial; null: no such pair).
     */
    roundTripEfficiency: finite.nullable(),
    roundTripStatus: z.enum(['complete', 'incomplete']).nullable().default(null),
    /** Median −ΔV/ΔI over the load steps found (steps told apart from meter noise); null when none. */
    internalResistanceOhms: finite.nullable(),
    loadStepCount: z.number().int().nonnegative().default(0),
    /** Lead-acid only: capacity corrected to 25 °C (IEEE 450 method). */
    correctedAh25C: finite.nullable(),
    /** Lowest and highest reading of each temperature channel, by the bench's channel name. */
    tempChannels: z.record(z.string(), z.object({ minCelsius: finite, maxCelsius: finite })).optional(),
    /** Protection checks only: one row per protection checked (see ProtectionResult). */
    protections: z.array(ProtectionResultSchema).optional(),
  })
  /** Whole-run totals (every discharge and charge in the run), apart from the capacity above. */
  .extend(RunTotalsSchema.shape);

export type RunSummary = z.infer<typeof RunSummarySchema>;
