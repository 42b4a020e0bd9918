import { z } from 'zod';
import { labelText, noteText } from './text.js';
import { ChemistrySchema } from './battery.js';

/** Longest single step we accept (a week): longer is a typing slip, not a test. */
export const MAX_STEP_SECONDS = 7 * 24 * 3600;
/** Most steps in a programme or in one repeat block. */
export const MAX_STEPS = 40;
/** Most passes of a repeat block. */
export const MAX_REPEATS = 500;
/** Largest set value we accept in any unit (A, W, Ω, V): far above any bench load. */
const MAX_SET_VALUE = 1_000_000;

const positive = () => z.number().finite().positive().max(MAX_SET_VALUE);
const seconds = () => z.number().finite().positive().max(MAX_STEP_SECONDS);

/** Charge CC-CV: `currentAmps` until the pack reaches `volts`, then hold `volts`; ends at the taper current or the time. */
export const ChargeStepSchema = z
  .object({
    kind: z.literal('charge'),
    volts: positive(),
    currentAmps: positive(),
    /** Ends when the charge current falls to this in the CV phase. */
    taperAmps: positive().optional(),
    /** Ends after this long whatever the current (also the taper's time limit). */
    maxSeconds: seconds().optional(),
  })
  .refine((s) => s.taperAmps !== undefined || s.maxSeconds !== undefined, { message: 'A charge ends at a taper current or after a time: give one', path: ['taperAmps'] })
  .refine((s) => s.taperAmps === undefined || s.taperAmps < s.currentAmps, { message: 'The taper current must be below the charge current', path: ['taperAmps'] });

/** Rest with every output off: for a time, or until the voltage settles (|dV/dt| under a threshold), at most `maxSeconds`. */
export const RestStepSchema = z
  .object({
    kind: z.literal('rest'),
    /** A fixed rest; with `settleVoltsPerMinute` the longest rest. */
    maxSeconds: seconds().optional(),
    /** Ends once the voltage moves less than this per minute (over the last minute). */
    settleVoltsPerMinute: positive().optional(),
  })
  .refine((s) => s.maxSeconds !== undefined || s.settleVoltsPerMinute !== undefined, { message: 'A rest ends after a time or when the voltage settles: give one', path: ['maxSeconds'] });

/** The load's regulation modes a discharge can use. */
export const DischargeModeSchema = z.enum(['cc', 'cp', 'cr']);
export type DischargeMode = z.infer<typeof DischargeModeSchema>;

/** Discharge at constant current (A), power (W) or resistance (Ω) to the end voltage, or sooner to a target Ah or Wh. */
export const DischargeStepSchema = z.object({
  kind: z.literal('discharge'),
  mode: DischargeModeSchema,
  /** Set value in the mode's unit: amps, watts or ohms. */
  value: positive(),
  endVolts: positive(),
  targetAh: positive().optional(),
  targetWh: positive().optional(),
});

/** Wait, outputs off, until a temperature is at or below (or at or above) a value. */
export const WaitTempStepSchema = z.object({
  kind: z.literal('wait-temp'),
  targetCelsius: z.number().finite().min(-60).max(120),
  direction: z.enum(['below', 'above']),
  /** Gives up (the programme fails safe) after this long. */
  maxSeconds: seconds(),
});

/** One step that drives the instruments (a repeat block holds these). */
export const SimpleStepSchema = z.discriminatedUnion('kind', [ChargeStepSchema, RestStepSchema, DischargeStepSchema, WaitTempStepSchema]);
export type SimpleStep = z.infer<typeof SimpleStepSchema>;

/** Repeat a block of steps `times` times (one level deep). */
export const RepeatStepSchema = z.object({
  kind: z.literal('repeat'),
  times: z.number().int().min(2).max(MAX_REPEATS),
  steps: z.array(SimpleStepSchema).min(1).max(MAX_STEPS),
});

/** One entry of a programme. */
export const ProgrammeStepSchema = z.discriminatedUnion('kind', [ChargeStepSchema, RestStepSchema, DischargeStepSchema, WaitTempStepSchema, RepeatStepSchema]);
export type ProgrammeStep = z.infer<typeof ProgrammeStepSchema>;
export type ChargeStep = z.infer<typeof ChargeStepSchema>;
export type RestStep = z.infer<typeof RestStepSchema>;
export type DischargeStep = z.infer<typeof DischargeStepSchema>;
export type WaitTempStep = z.infer<typeof WaitTempStepSchema>;

/**
 * What a technician saves: the steps and the pack they are written for (chemistry and cells in
 * series give the voltage floor; `maxCurrentAmps` the pack's protection rating), so a programme
 * with unsafe values is refused when saved and again, against the run's pack, when started.
 */
export const ProgrammeInputSchema = z.object({
  name: labelText(120),
  description: noteText(2000).optional(),
  chemistry: ChemistrySchema,
  cellsInSeries: z.number().int().min(1).max(600),
  /** The pack's protection (BMS) current rating, A: no step may ask for more. */
  maxCurrentAmps: positive(),
  steps: z.array(ProgrammeStepSchema).min(1).max(MAX_STEPS),
});
export type ProgrammeInput = z.infer<typeof ProgrammeInputSchema>;

/** A saved programme as the API returns it. */
export const ProgrammeSchema = ProgrammeInputSchema.extend({
  id: z.number().int(),
  description: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Programme = z.infer<typeof ProgrammeSchema>;
