import { z } from 'zod';
import type { Frame } from '../schemas/frame.js';
import type { Reading, RunTotals } from '../schemas/reading.js';
import type { RunEvent } from '../schemas/run-event.js';
import { MeasureConfigSchema, type MeasureConfig, type MeasureConfigInput } from '../schemas/measure-config.js';
import { SECONDS_PER_HOUR } from '../units/time.js';
import { sumValue } from './compensated-sum.js';
import { createIntegratorState, integratorTotals, IntegratorStateSchema, type IntegratorState } from './integrator-state.js';
import { integrateStep, type StepOutcome } from './integrator.js';
import { createDetectorState, DetectorStateSchema, detectStep, resolveDetectorSettings, type DetectorSettings, type DetectorState } from './detector.js';
import { HALF_RATED } from './detector-settings.js';
import { resolveGapLimit, type GapLimit } from './gap-limit.js';
import { createRunStats, RunStatsSchema, updateRunStats, type RunStats } from './run-stats.js';
import { trackRoundTrip } from './round-trip.js';
import { trackLoadSteps } from './internal-resistance.js';

/** Everything needed to resume a run exactly: plain JSON, safe to archive. */
export interface RunPipelineSnapshot {
  version: 1;
  config: MeasureConfig;
  /** Source-clock t of elapsedSeconds = 0 (null until the first accepted frame). */
  originT: number | null;
  integrator: IntegratorState;
  detector: DetectorState;
  stats: RunStats;
}

/** Checks a snapshot read back from storage before it is trusted. */
export const RunPipelineSnapshotSchema = z.object({
  version: z.literal(1),
  config: MeasureConfigSchema,
  originT: z.number().finite().nullable(),
  integrator: IntegratorStateSchema,
  detector: DetectorStateSchema,
  stats: RunStatsSchema,
});

/** What one frame became: a Reading (null if refused), the events it confirmed, and why. */
export interface PushResult {
  reading: Reading | null;
  events: readonly RunEvent[];
  outcome: StepOutcome;
}

/** The run pipeline: integrator + detector over one run. See createRunPipeline. */
export interface RunPipeline {
  readonly config: MeasureConfig;
  readonly settings: DetectorSettings;
  /** The gap limit in force and how it was decided (explicit, the source's cadence, or the default). */
  readonly gapLimit: GapLimit;
  push(frame: Frame): PushResult;
  pushMany(frames: Iterable<Frame>): { readings: Reading[]; events: RunEvent[]; rejected: number };
  totals(): RunTotals;
  snapshot(): RunPipelineSnapshot;
  restore(snapshot: unknown): void;
}

const NO_EVENTS: readonly RunEvent[] = Object.freeze([]);

/**
 * The main entry point of the measurement core, used by the live server, the importer and
 * the simulator alike: `createRunPipeline(config)` returns an object whose `push(frame)`
 * integrates the frame (trapezoid, compensated sums, Wh/Ah out and in kept apart), runs
 * the event detector over the resulting Reading and returns `{ reading, events, outcome }`.
 * - A refused frame (non-finite value, beyond the core's range, t backwards or repeated) gives `reading: null` and
 *   changes nothing; `outcome` says why. Frames should already have passed FrameSchema.
 * - A step in t longer than the gap limit (`maxGapSeconds` if given, else `gapFactor` ×
 *   `cadenceSeconds`, else 30 s) is not integrated; a `gap` event is returned.
 * - Event `elapsedSeconds` and `reading.elapsedSeconds` are seconds since the run's origin
 *   (`config.originT`, else the first accepted frame's t).
 * - `snapshot()` returns plain JSON; `createRunPipeline(config, snapshot)` or `restore()`
 *   resumes exactly (same totals, same pending detections) after a restart.
 * Work per frame is constant. Sign convention: positive amps = discharge.
 */
export function createRunPipeline(config: MeasureConfigInput, snapshot?: unknown): RunPipeline {
  let cfg = MeasureConfigSchema.parse(config);
  let settings = resolveDetectorSettings(cfg);
  let gapLimit = resolveGapLimit(cfg);
  // Built once per config, not per frame (the pipeline's per-frame work allocates nothing it can avoid).
  let stepOptions = { collapseVolts: settings.collapseVolts };
  let originT: number | null = cfg.originT ?? null;
  let integ = createIntegratorState();
  let det = createDetectorState(settings);
  let stats = createRunStats();
  const scratch: RunEvent[] = [];

  function restore(raw: unknown): void {
    const snap = RunPipelineSnapshotSchema.parse(structuredClone(raw));
    cfg = snap.config;
    settings = resolveDetectorSettings(cfg);
    gapLimit = resolveGapLimit(cfg);
    stepOptions = { collapseVolts: settings.collapseVolts };
    originT = snap.originT;
    integ = snap.integrator;
    det = snap.detector as unknown as DetectorState;
    stats = snap.stats;
    if (det.tempProtections.length !== settings.tempProtections.length) throw new Error('snapshot: temperature protections do not match its config');
    if (det.protectionChecks.length !== settings.protectionChecks.length) throw new Error('snapshot: protection checks do not match its config');
  }
  if (snapshot !== undefined) restore(snapshot);

  function push(frame: Frame): PushResult {
    const prevT = integ.lastT;
    const outcome = integrateStep(integ, frame.t, frame.volts, frame.amps, gapLimit.seconds);
    if (outcome === 'non-finite' || outcome === 'out-of-range' || outcome === 'backwards' || outcome === 'duplicate') return { reading: null, events: NO_EVENTS, outcome };
    if (originT === null) originT = frame.t;
    const elapsedSeconds = frame.t - originT;
    const reading: Reading = {
      t: frame.t, volts: frame.volts, amps: frame.amps, temps: frame.temps, aux: frame.aux, clock: frame.clock, seq: frame.seq,
      elapsedSeconds, watts: frame.volts * frame.amps,
      dischargeWh: sumValue(integ.dischargeWs) / SECONDS_PER_HOUR,
      dischargeAh: sumValue(integ.dischargeAs) / SECONDS_PER_HOUR,
      chargeWh: sumValue(integ.chargeWs) / SECONDS_PER_HOUR,
      chargeAh: sumValue(integ.chargeAs) / SECONDS_PER_HOUR,
    };
    updateRunStats(stats, elapsedSeconds, frame.volts, frame.amps, frame.temps, settings.loadOnAmps, outcome === 'gap');
    trackRoundTrip(stats.roundTrip, reading, settings.loadOnAmps, settings.zeroAmps);
    trackLoadSteps(stats.loadSteps, reading, outcome === 'gap', stepOptions);
    // Setting an array's length costs a runtime call even when it is already 0.
    if (scratch.length !== 0) scratch.length = 0;
    if (outcome === 'gap' && prevT !== null) scratch.push({ type: 'gap', elapsedSeconds: prevT - originT, endElapsedSeconds: elapsedSeconds, gapSeconds: frame.t - prevT });
    detectStep(det, settings, reading, scratch);
    return { reading, events: scratch.length === 0 ? NO_EVENTS : scratch.slice(), outcome };
  }

  return {
    get config() { return cfg; },
    get settings() { return settings; },
    get gapLimit() { return gapLimit; },
    push,
    pushMany(frames) {
      const readings: Reading[] = [];
      const events: RunEvent[] = [];
      let rejected = 0;
      for (const f of frames) {
        const r = push(f);
        if (r.reading) readings.push(r.reading);
        else rejected++;
        for (const e of r.events) events.push(e);
      }
      return { readings, events, rejected };
    },
    totals: () => integratorTotals(integ),
    snapshot: () => structuredClone({ version: 1 as const, config: cfg, originT, integrator: integ, detector: det, stats }),
    restore,
  };
}

/**
 * Starts a pipeline that continues a run from archived totals when no full snapshot was
 * kept: totals carry on, pending detections start afresh, and the first frame after the
 * restart begins a new trapezoid (nothing is integrated across the downtime).
 */
export function resumeRunPipeline(config: MeasureConfigInput, totals: RunTotals, originT: number): RunPipeline {
  const cfg = MeasureConfigSchema.parse({ ...config, originT });
  const settings = resolveDetectorSettings(cfg);
  const detector = createDetectorState(settings);
  // Capacity marks already passed before the restart must not fire a second time.
  const { ratedAh, ratedWh } = settings;
  if (ratedAh !== null && totals.dischargeAh >= ratedAh * HALF_RATED) detector.milestones.fired.push('half-rated-ah');
  if (ratedAh !== null && totals.dischargeAh >= ratedAh) detector.milestones.fired.push('rated-ah');
  if (ratedWh !== null && totals.dischargeWh >= ratedWh * HALF_RATED) detector.milestones.fired.push('half-rated-wh');
  if (ratedWh !== null && totals.dischargeWh >= ratedWh) detector.milestones.fired.push('rated-wh');
  return createRunPipeline(cfg, {
    version: 1, config: cfg, originT, integrator: createIntegratorState(totals), detector, stats: createRunStats(),
  } satisfies RunPipelineSnapshot);
}
