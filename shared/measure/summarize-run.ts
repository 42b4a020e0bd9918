import type { RunEvent, CutoffEvent, RecoveryEvent } from '../schemas/run-event.js';
import { RunSummarySchema, type RunSummary } from '../schemas/run-summary.js';
import { meansUnderLoad } from './run-stats.js';
import { sumValue } from './compensated-sum.js';
import { integratorTotals, rejectedCounts } from './integrator-state.js';
import type { RunPipelineSnapshot } from './run-pipeline.js';
import { DEFAULT_ACCEPTANCE_PERCENT, costPerKWh, cRate, percentOfRated, roundTripEfficiency, verdictFor, whPerKg } from './figures.js';
import { nominalVolts } from './nominal.js';
import { internalResistanceFromSteps, type VoltAmpSample } from './internal-resistance.js';
import { correctedAhAt25C, inCapacityFactorRange } from './lead-acid-correction.js';
import { resolveGapLimit } from './gap-limit.js';

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
  /** Readings for internal resistance from load steps (optional; omit for none). */
  readings?: ArrayLike<VoltAmpSample>;
  /** Lead-acid: initial electrolyte/cell temperature for the IEEE 450 correction, °C (outside its table: no correction). */
  leadAcidTempCelsius?: number | null;
}

/**
 * Figures and verdict of one run. Delivered capacity is taken at the first cutoff (the
 * Ah/Wh at the end voltage or the protection opening); without a cutoff, the final totals.
 */
export function summarizeRun(input: SummarizeRunInput): RunSummary {
  const { snapshot, events } = input;
  const cfg = snapshot.config;
  const integ = snapshot.integrator;
  const totals = integratorTotals(integ);
  const cutoff = events.find((e): e is CutoffEvent => e.type === 'cutoff') ?? null;
  const recovery = events.find((e): e is RecoveryEvent => e.type === 'recovery') ?? null;
  const deliveredAh = cutoff?.dischargeAh ?? totals.dischargeAh;
  const deliveredWh = cutoff?.dischargeWh ?? totals.dischargeWh;
  const { meanVolts, meanAmps, meanWatts } = meansUnderLoad(snapshot.stats);
  const percentRatedAh = percentOfRated(deliveredAh, cfg.ratedAh);
  const percentRatedWh = percentOfRated(deliveredWh, cfg.ratedWh);
  const basis = input.verdictBasis ?? 'ah';
  const percents = basis === 'both' ? [percentRatedAh, percentRatedWh] : basis === 'wh' ? [percentRatedWh] : [percentRatedAh ?? percentRatedWh];
  const acceptancePercent = input.acceptancePercent ?? DEFAULT_ACCEPTANCE_PERCENT;
  const ir = input.readings ? internalResistanceFromSteps(input.readings).medianOhms : null;
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
    nominalVolts: nominalVolts(cfg.chemistry, cfg.cellsInSeries),
    ratedAh: cfg.ratedAh ?? null,
    ratedWh: cfg.ratedWh ?? null,
    percentRatedAh,
    percentRatedWh,
    acceptancePercent,
    verdict: verdictFor(percents, acceptancePercent),
    cutoffCause: cutoff?.cause ?? null,
    cutoffVolts: cutoff?.volts ?? null,
    recoverySeconds: recovery?.recoverySeconds ?? null,
    cRate: cRate(meanAmps, cfg.ratedAh),
    costPerKWh: costPerKWh(input.price, deliveredWh),
    whPerKg: whPerKg(deliveredWh, input.massKg),
    roundTripEfficiency: roundTripEfficiency(totals.dischargeWh, totals.chargeWh),
    internalResistanceOhms: ir,
    correctedAh25C: cfg.chemistry === 'lead-acid' && leadTemp !== null && inCapacityFactorRange(leadTemp) ? correctedAhAt25C(deliveredAh, leadTemp) : null,
  });
}
