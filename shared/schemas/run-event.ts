import { z } from 'zod';
import { ProtectionSchema } from './protection-check.js';

/** Every event carries `elapsedSeconds`: run time, seconds since the run's origin (the clock of Reading.elapsedSeconds). */
const base = { elapsedSeconds: z.number().finite() };
const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/** Why a discharge stopped: the run's end voltage, or the battery's own protection. */
export const CutoffCauseSchema = z.enum(['end-voltage', 'protection']);
/** What showed the protection opening. */
export const ProtectionSignalSchema = z.enum(['voltage-collapse', 'current-zero']);

export const CutoffEventSchema = z.object({
  ...base,
  type: z.literal('cutoff'),
  cause: CutoffCauseSchema,
  /** Present when cause = protection. */
  signal: ProtectionSignalSchema.optional(),
  /**
   * End voltage: the interpolated crossing (volts = the end voltage; elapsedSeconds, amps, Wh, Ah at that
   * instant). Protection: the last voltage and current under load before it opened.
   */
  volts: finite,
  amps: finite,
  dischargeWh: nonNeg,
  dischargeAh: nonNeg,
  /** End voltage reached with no discharge reading above it: the pack was below it when the test began. */
  startedBelowEndVoltage: z.boolean().optional(),
});

export const RecoveryEventSchema = z.object({
  ...base,
  type: z.literal('recovery'),
  /** Run time of the protection cutoff this recovery follows. */
  cutoffElapsedSeconds: finite,
  recoverySeconds: nonNeg,
  volts: finite,
});

export const AlarmLevelSchema = z.enum(['info', 'warning', 'critical']);
export const AlarmEventSchema = z.object({
  ...base,
  type: z.literal('alarm'),
  level: AlarmLevelSchema,
  /** Stable machine code, e.g. `cutoff`, `source-lost`, `over-temperature`. */
  code: z.string().min(1).max(64),
  message: z.string().max(500),
});

/** Someone acknowledged an alarm of the run (ISA-18.2 practice: who and when is kept). */
export const AlarmAckEventSchema = z.object({
  ...base,
  type: z.literal('alarm-ack'),
  alarmId: z.number().int().positive(),
  /** The alarm's kind, e.g. `cutoff`. */
  code: z.string().min(1).max(64),
  by: z.string().max(200),
  /** When it was acknowledged (ISO 8601, server clock). */
  at: z.string().max(40),
});

export const AnnotationEventSchema = z.object({
  ...base,
  type: z.literal('annotation'),
  text: z.string().min(1).max(2000),
  author: z.string().max(200).optional(),
});

/** Readings stopped for longer than the gap limit; nothing was integrated across it. `elapsedSeconds` = last reading before. */
export const GapEventSchema = z.object({
  ...base,
  type: z.literal('gap'),
  /** Run time of the first reading after the gap. */
  endElapsedSeconds: finite,
  gapSeconds: nonNeg,
});

export const SourceLostEventSchema = z.object({
  ...base,
  type: z.literal('source-lost'),
  reason: z.string().max(500).optional(),
});

export const SourceRestoredEventSchema = z.object({
  ...base,
  type: z.literal('source-restored'),
  downSeconds: nonNeg.optional(),
});

/** Which temperature protection: charge inhibited when cold, or cut off when hot. */
export const ProtectionKindSchema = z.enum(['low-temp-charge', 'high-temp-charge', 'high-temp-discharge', 'high-temp', 'low-temp']);

export const ProtectionTripEventSchema = z.object({
  ...base,
  type: z.literal('protection-trip'),
  kind: ProtectionKindSchema,
  channel: z.string(),
  limitCelsius: finite,
  /** Run time at which the temperature first crossed the limit. */
  crossedElapsedSeconds: finite,
  /** Temperature at the trip (current ≈ 0 A). */
  tempCelsius: finite,
  /** elapsedSeconds − crossedElapsedSeconds: the protection's delay, within one sample period. */
  delaySeconds: nonNeg,
  /** Past the limit from the first reading, with no current: the delay is not known (0 here). */
  beyondAtStart: z.boolean().optional(),
});

export const ProtectionResetEventSchema = z.object({
  ...base,
  type: z.literal('protection-reset'),
  kind: ProtectionKindSchema,
  channel: z.string(),
  tempCelsius: finite,
});

export const HeaterOnEventSchema = z.object({
  ...base,
  type: z.literal('heater-on'),
  /** Temperature when the heater started (null when no temperature channel). */
  tempCelsius: finite.nullable(),
  heaterAmps: finite,
});

export const HeaterOffEventSchema = z.object({
  ...base,
  type: z.literal('heater-off'),
  tempCelsius: finite.nullable(),
  /** Time-weighted mean heater current while on (PWM off slots included: the element's true average). */
  meanHeaterAmps: finite,
  onSeconds: nonNeg,
  /** Largest heater current while on (the element's current in a PWM on slot). */
  peakHeaterAmps: finite.optional(),
  /** Share of the on time with the current above the on threshold, % (100 for a heater not pulsed). */
  dutyPercent: finite.optional(),
});

/** A checked protection acted: its current stopped (or the heater switched) with the signal past the threshold. */
export const ProtectionCheckTripEventSchema = z.object({
  ...base,
  type: z.literal('protection-check-trip'),
  protection: ProtectionSchema,
  /** Index of the check in the run's list. */
  check: z.number().int().nonnegative(),
  /** First reading past the threshold (null when the pack was past it from the start). */
  crossedElapsedSeconds: finite.nullable(),
  /** The signal at the last reading before the current stopped. */
  value: finite,
  delaySeconds: nonNeg.nullable(),
  beyondAtStart: z.boolean(),
});

/** Current flows again after a checked protection acted (charging resumes after warming, reconnect after a cutoff). */
export const ProtectionCheckReleaseEventSchema = z.object({
  ...base,
  type: z.literal('protection-check-release'),
  protection: ProtectionSchema,
  check: z.number().int().nonnegative(),
  /** Run time of the trip it ends. */
  tripElapsedSeconds: finite,
  /** The signal at the first reading with current flowing again. */
  value: finite,
  resumeSeconds: nonNeg,
});

export const MilestoneKindSchema = z.enum(['half-rated-ah', 'rated-ah', 'half-rated-wh', 'rated-wh', 'near-end-voltage']);

export const MilestoneEventSchema = z.object({
  ...base,
  type: z.literal('milestone'),
  milestone: MilestoneKindSchema,
  volts: finite,
  dischargeWh: nonNeg,
  dischargeAh: nonNeg,
});

/** Run lifecycle markers written by whoever starts and stops a run. */
export const RunMarkEventSchema = z.object({
  ...base,
  type: z.enum(['run-start', 'run-stop', 'load-on', 'load-off']),
  note: z.string().max(500).optional(),
});

/** What happened to a test programme's step: it began, ended, was skipped, paused, resumed, failed safe or was aborted. */
export const ProgrammeStepPhaseSchema = z.enum(['start', 'end', 'skip', 'pause', 'resume', 'fail', 'abort']);

/** A test programme's step changed (the run follows a programme); `reason` says why it ended, failed or was aborted. */
export const ProgrammeStepEventSchema = z.object({
  ...base,
  type: z.literal('programme-step'),
  phase: ProgrammeStepPhaseSchema,
  /** Index in the unrolled step list, from 0. */
  index: z.number().int().nonnegative(),
  label: z.string().max(200),
  reason: z.string().max(500).optional(),
  /** On a fail: false when not every output could be confirmed off (a person must check the bench). */
  outputsConfirmedOff: z.boolean().optional(),
});

/** One event on a run's timeline. Discriminated on `type`. */
export const RunEventSchema = z.discriminatedUnion('type', [
  CutoffEventSchema,
  RecoveryEventSchema,
  AlarmEventSchema,
  AlarmAckEventSchema,
  AnnotationEventSchema,
  GapEventSchema,
  SourceLostEventSchema,
  SourceRestoredEventSchema,
  ProtectionTripEventSchema,
  ProtectionResetEventSchema,
  HeaterOnEventSchema,
  HeaterOffEventSchema,
  ProtectionCheckTripEventSchema,
  ProtectionCheckReleaseEventSchema,
  MilestoneEventSchema,
  RunMarkEventSchema,
  ProgrammeStepEventSchema,
]);

export type RunEvent = z.infer<typeof RunEventSchema>;
export type RunEventType = RunEvent['type'];
export type CutoffEvent = z.infer<typeof CutoffEventSchema>;
export type RecoveryEvent = z.infer<typeof RecoveryEventSchema>;
export type AlarmEvent = z.infer<typeof AlarmEventSchema>;
export type AlarmAckEvent = z.infer<typeof AlarmAckEventSchema>;
export type AnnotationEvent = z.infer<typeof AnnotationEventSchema>;
export type GapEvent = z.infer<typeof GapEventSchema>;
export type SourceLostEvent = z.infer<typeof SourceLostEventSchema>;
export type SourceRestoredEvent = z.infer<typeof SourceRestoredEventSchema>;
export type ProtectionTripEvent = z.infer<typeof ProtectionTripEventSchema>;
export type ProtectionResetEvent = z.infer<typeof ProtectionResetEventSchema>;
export type HeaterOnEvent = z.infer<typeof HeaterOnEventSchema>;
export type HeaterOffEvent = z.infer<typeof HeaterOffEventSchema>;
export type ProtectionCheckTripEvent = z.infer<typeof ProtectionCheckTripEventSchema>;
export type ProtectionCheckReleaseEvent = z.infer<typeof ProtectionCheckReleaseEventSchema>;
export type MilestoneEvent = z.infer<typeof MilestoneEventSchema>;
export type ProgrammeStepEvent = z.infer<typeof ProgrammeStepEventSchema>;
export type MilestoneKind = z.infer<typeof MilestoneKindSchema>;
export type ProtectionKind = z.infer<typeof ProtectionKindSchema>;
