import type { RunEvent, RecoveryEvent } from '../schemas/run-event.js';
import { RunSummarySchema, type RunSummary } from '../schemas/run-summary.js';
import { meansUnderLoad } from './run-stats.js';
import { sumValue } from './compensated-sum.js';
import { integratorTotals, rejectedCounts } from './integrator-state.js';
import type { RunPipelineSnapshot } from './run-pipeline.js';
import { DEFAULT_ACCEPTANCE_PERCENT, costPerKWh, cRate, percentOfRated, verdictWithUncertainty, whPerKg } from './figures.js';
import { capacityUncertainty } from './uncertainty.js';
import type { MeterAccuracy } from '../schemas/meter-accuracy.js';
import { nominalVolts } from './nominal.js';
import { internalResistanceFromSteps, medianStepOhms, type VoltAmpReading } from './internal-resistance.js';
import { correctedAhAt25C, inCapacityFactorRange } from './lead-acid-correction.js';
import { resolveGapLimit } from './gap-limit.js';
import { capacityResult, COMPLETE_ENDS } from './capacity-result.js';
import { resolveDetectorSettings } from './detector-settings.js';
import { testConditionFlags } from './test-conditions.js';
import { roundTripResult } from './round-trip.js';

/**
 * A derived figure (a ratio of a run's totals to a rating, a price or a mass) that cannot
 * be represented, such as a price over a vanishing energy, is not known: null, never Infinity.
 */
function known(x: number | null): number | null {
  return x !== null && Number.isFinite(x) ? x : null;
}

/** What summarizeRun needs beyond the pipeline's own state. */
export interface SummarizeRunInput {
  /** pipeline.snapshot() at the end of the run. */
  snapshot: RunPipelineSnapshot;
  /** Every event of the run (the pipeline's and any others). */
  events: readonly RunEvent[];
  acceptancePercent?: number;
  /** Which rating the verdict checks: Ah (default, as IEC 61960-3 rates capacity), Wh, or both. */
  verdictBasis?: 'ah' | 'wh' | 'both';
  /** Battery price (any currency) for cost per delivered kWh. */
  price?: number | null;
  massKg?: number | null;
  /** Readings to find load steps in for the internal resistance (default: the steps the pipeline found as it ran). */
  readings?: ArrayLike<VoltAmpReading>;
  /** Lead-acid: initial electrolyte/cell temperature for the IEEE 450 correction, °C (outside its table: no correction). */
  leadAcidTempCelsius?: number | null;
  /** The run has ended (default true); while it records, a capacity not yet reached is "in progress". */
  ended?: boolean;
  /** A protection trip ends the test even when the pack reconnects (default false: the test runs on). */
  protectionEndsTest?: boolean;
  /** The bench meter's stated accuracy: gives the capacity's uncertainty and a `borderline` verdict inside it. */
  meterAccuracy?: MeterAccuracy | null;
}

/**
 * Figures and verdict of one run. The capacity is what capacityResult reads from the events
 * (to the interpolated end-voltage crossing, or the protection that ended the test); the
 * verdict uses it and nothing else, and is `incomplete` when there is none. The whole-run
 * totals are reported beside it, apart.
 */
export function summarizeRun(input: SummarizeRunInput): RunSummary {
  const { snapshot, events } = input;
  const cfg = snapshot.config;
  const integ = snapshot.integrator;
  const totals = integratorTotals(integ);
  const settings = resolveDetectorSettings(cfg);
  const means = meansUnderLoad(snapshot.stats);
  const [meanVolts, meanAmps, meanWatts] = [known(means.meanVolts), known(means.meanAmps), known(means.meanWatts)];
  const capacity = capacityResult({
    events, totals, endVolts: settings.endVolts, ended: input.ended ?? true,
    protectionEndsTest: input.protectionEndsTest ?? false, sawLoad: snapshot.stats.loadSeconds > 0,
  });
  const cutoff = capacity.cutoff;
  const firstTrip = capacity.trips[0];
  const recovery = firstTrip ? events.find((e): e is RecoveryEvent => e.type === 'recovery' && e.cutoffElapsedSeconds === firstTrip.elapsedSeconds) ?? null : null;
  const deliveredAh = capacity.capacityAh;
  const deliveredWh = capacity.capacityWh;
  const percentRatedAh = known(percentOfRated(deliveredAh, cfg.ratedAh));
  const percentRatedWh = known(percentOfRated(deliveredWh, cfg.ratedWh));
  const basis = input.verdictBasis ?? 'ah';
  const uncertainty = input.meterAccuracy && deliveredAh !== null
    ? capacityUncertainty(input.meterAccuracy, { ah: deliveredAh, wh: deliveredWh, loadSeconds: snapshot.stats.loadSeconds, voltSeconds: snapshot.stats.loadVoltSeconds })
    : null;
  const ahItem = { percent: percentRatedAh, expandedPercent: known(percentOfRated(uncertainty?.expandedAh, cfg.ratedAh)) };
  const whItem = { percent: percentRatedWh, expandedPercent: known(percentOfRated(uncertainty?.expandedWh, cfg.ratedWh)) };
  const items = basis === 'both' ? [ahItem, whItem] : basis === 'wh' ? [whItem] : [percentRatedAh !== null ? ahItem : whItem];
  const acceptancePercent = input.acceptancePercent ?? DEFAULT_ACCEPTANCE_PERCENT;
  const rate = known(cRate(meanAmps, cfg.ratedAh));
  const testMinTempCelsius = snapshot.stats.loadMinTempCelsius ?? null;
  const testMaxTempCelsius = snapshot.stats.loadMaxTempCelsius ?? null;
  const roundTrip = roundTripResult(snapshot.stats.roundTrip);
  const verdict = COMPLETE_ENDS.has(capacity.endedBy) ? verdictWithUncertainty(items, acceptancePercent) : 'incomplete';
  const fromReadings = input.readings ? internalResistanceFromSteps(input.readings, { collapseVolts: settings.collapseVolts }) : null;
  const irOhms = known(fromReadings ? fromReadings.medianOhms : medianStepOhms(snapshot.stats.loadSteps));
  const loadStepCount = fromReadings ? fromReadings.steps.length : snapshot.stats.loadSteps.steps;
  const leadTemp = input.leadAcidTempCelsius ?? null;
  const gapLimit = resolveGapLimit(cfg);
  return RunSummarySchema.parse({
    ...totals,
    durationSeconds: snapshot.stats.lastElapsedSeconds ?? 0,
    readings: integ.accepted,
    rejectedReadings: rejectedCounts(integ).total,
    gaps: integ.gaps,
    gapSeconds: sumValue(integ.gapSeconds),
    maxGapSeconds: gapLimit.seconds,
    gapLimitBasis: gapLimit.basis,
    cadenceSeconds: gapLimit.cadenceSeconds,
    meanVolts,
    meanAmps,
    meanWatts,
    minVolts: snapshot.stats.minVolts,
    maxVolts: snapshot.stats.maxVolts,
    minTempCelsius: snapshot.stats.minTempCelsius,
    maxTempCelsius: snapshot.stats.maxTempCelsius,
    chemistry: cfg.chemistry ?? null,
    cellsInSeries: cfg.cellsInSeries ?? null,
    nominalVolts: known(nominalVolts(cfg.chemistry, cfg.cellsInSeries)),
    ratedAh: cfg.ratedAh ?? null,
    ratedWh: cfg.ratedWh ?? null,
    capacityAh: deliveredAh,
    capacityWh: deliveredWh,
    capacityEndedBy: capacity.endedBy,
    capacityEndSeconds: capacity.endSeconds,
    protectionTrips: capacity.trips,
    protectionTripCount: capacity.tripCount,
    loadOnAmps: settings.loadOnAmps,
    percentRatedAh,
    percentRatedWh,
    acceptancePercent,
    verdict,
    uncertainty,
    cutoffCause: cutoff?.cause ?? null,
    cutoffVolts: cutoff?.volts ?? null,
    recoverySeconds: recovery?.recoverySeconds ?? null,
    cRate: rate,
    testMinTempCelsius,
    testMaxTempCelsius,
    ...testConditionFlags(rate, testMinTempCelsius, testMaxTempCelsius),
    costPerKWh: known(costPerKWh(input.price, deliveredWh)),
    whPerKg: known(whPerKg(deliveredWh, input.massKg)),
    roundTripEfficiency: known(roundTrip.efficiency),
    roundTripStatus: roundTrip.status,
    internalResistanceOhms: irOhms,
    loadStepCount,
    correctedAh25C: known(cfg.chemistry === 'lead-acid' && leadTemp !== null && inCapacityFactorRange(leadTemp) && deliveredAh !== null ? correctedAhAt25C(deliveredAh, leadTemp) : null),
  });
}
