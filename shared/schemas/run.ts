import { z } from 'zod';
import { RunSummarySchema } from './run-summary.js';
import { TempProtectionSchema } from './measure-config.js';
import { ProtectionExpectationSchema } from './protection-check.js';
import { MeterAccuracySchema } from './meter-accuracy.js';

/** What a run is for; decides which detectors matter and how the verdict is read. */
export const RunKindSchema = z.enum(['capacity-discharge', 'charge', 'protection-check', 'custom']);
export type RunKind = z.infer<typeof RunKindSchema>;

/**
 * Lifecycle: armed (waiting for the first frame) → recording → cutoff → recovered →
 * finished; aborted from any live state. Only `finished` and `aborted` are final.
 */
export const RunStateSchema = z.enum(['armed', 'recording', 'cutoff', 'recovered', 'finished', 'aborted']);
export type RunState = z.infer<typeof RunStateSchema>;
export const LIVE_RUN_STATES: readonly RunState[] = ['armed', 'recording', 'cutoff', 'recovered'];

/** Where the readings came from: a bench recorded live, or a CSV log imported. */
export const RunOriginSchema = z.enum(['live', 'import']);

/** The end voltage, either per cell (× the battery's cells in series) or for the whole pack. */
export const EndVoltsSchema = z.discriminatedUnion('mode', [
  z.object({
    mode: z.literal('per-cell'),
    voltsPerCell: z.number().finite().positive(),
    /** Overrides the battery's own cells in series when given. */
    cellsInSeries: z.number().int().positive().optional(),
  }),
  z.object({ mode: z.literal('absolute'), volts: z.number().finite().positive() }),
]);
export type EndVolts = z.infer<typeof EndVoltsSchema>;

/** Alarm thresholds for a run; null/absent means "no alarm of that kind". */
export const RunAlarmsSchema = z.object({
  /** Warn when volts fall within this margin of the end voltage. */
  nearEndMarginVolts: z.number().finite().nonnegative().optional(),
  highTempCelsius: z.number().finite().optional(),
  lowTempCelsius: z.number().finite().optional(),
  /** Raise an alarm event at cutoff (default on). */
  onCutoff: z.boolean().default(true),
});
export type RunAlarms = z.infer<typeof RunAlarmsSchema>;

/** When the server ends a run by itself. `manual` = only a technician stops it. */
export const StopWhenSchema = z.enum(['after-recovery', 'target-ah', 'target-wh', 'manual']);
export type StopWhen = z.infer<typeof StopWhenSchema>;

const id = z.number().int().positive();

/** One run as the API returns it. Times are ISO-8601 strings (UTC). */
export const RunSchema = z.object({
  id,
  name: z.string().min(1).max(200),
  tags: z.array(z.string().min(1).max(50)).max(30),
  origin: RunOriginSchema,
  benchId: id.nullable(),
  batteryId: id.nullable(),
  kind: RunKindSchema,
  state: RunStateSchema,
  endVolts: EndVoltsSchema.nullable(),
  acceptancePercent: z.number().finite().positive().max(1000),
  alarms: RunAlarmsSchema,
  stopWhen: StopWhenSchema,
  /** Temperature protections to time (protection checks): limit crossed → current ≈ 0 A. Absent = none. */
  tempProtections: z.array(TempProtectionSchema).optional(),
  /** Protection checks: each protection's expected threshold and delay, resolved when the run started (typed on the run, else the pack's record). */
  protectionChecks: z.array(ProtectionExpectationSchema).optional(),
  /** Ah delivered at which a `target-ah` run stops. */
  targetAh: z.number().finite().positive().nullable(),
  /** Wh delivered at which a `target-wh` run stops. */
  targetWh: z.number().finite().positive().nullable(),
  /** Seconds after recovery to keep recording before an `after-recovery` run finishes. */
  afterRecoverySeconds: z.number().finite().nonnegative(),
  /**
   * A protection trip ends the test (capacity to the first trip) even when the pack reconnects.
   * Absent or false: a trip that reconnects is listed and the test runs on to the end voltage.
   */
  protectionEndsTest: z.boolean().optional(),
  /** Gap limit typed on the run, s; null or absent = from the source's cadence (shared/measure/gap-limit.ts). */
  maxGapSeconds: z.number().finite().positive().nullable().optional(),
  /** Lead-acid: initial electrolyte temperature, °C, for the correction to 25 °C (absent: none given). */
  electrolyteTempCelsius: z.number().finite().nullable().optional(),
  /** The bench meter's stated accuracy when the run started, kept with the run (absent: none stated). */
  meterAccuracy: MeterAccuracySchema.nullable().optional(),
  readingsCount: z.number().int().nonnegative(),
  summary: RunSummarySchema.nullable(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  createdBy: id.nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Run = z.infer<typeof RunSchema>;
