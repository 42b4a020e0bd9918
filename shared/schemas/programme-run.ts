import { z } from 'zod';
import { ProgrammeInputSchema } from './programme.js';

const finite = z.number().finite();
const nonNeg = z.number().finite().nonnegative();

/** How a step ended. */
export const StepOutcomeSchema = z.enum(['done', 'skipped', 'failed', 'aborted']);
export type StepOutcome = z.infer<typeof StepOutcomeSchema>;

/** What ended a step. */
export const StepEndCauseSchema = z.enum(['taper', 'time', 'settled', 'end-voltage', 'target', 'temperature', 'skipped', 'fault', 'aborted']);
export type StepEndCause = z.infer<typeof StepEndCauseSchema>;

/** One step's figures: what went in and came out while it ran (from the run's own integrator). */
export const StepResultSchema = z.object({
  index: z.number().int().nonnegative(),
  label: z.string(),
  kind: z.enum(['charge', 'rest', 'discharge', 'wait-temp']),
  outcome: StepOutcomeSchema,
  cause: StepEndCauseSchema,
  /** Why it ended, in words (taper current reached, end voltage reached, meter silent, ...). */
  reason: z.string(),
  /** Run time (s) at its start and end. */
  startElapsedSeconds: finite,
  endElapsedSeconds: finite,
  chargeAh: nonNeg,
  chargeWh: nonNeg,
  dischargeAh: nonNeg,
  dischargeWh: nonNeg,
  /** Pack volts at the step's end (null without a reading). */
  endVolts: finite.nullable(),
});
export type StepResult = z.infer<typeof StepResultSchema>;

/** A discharge paired with the full (tapered) charge after it: Wh out ÷ Wh in, Ah out ÷ Ah in. */
export const RoundTripPairSchema = z.object({
  dischargeIndex: z.number().int().nonnegative(),
  chargeIndex: z.number().int().nonnegative(),
  energyEfficiency: nonNeg,
  coulombicEfficiency: nonNeg,
});
export type RoundTripPair = z.infer<typeof RoundTripPairSchema>;

/** Where a run's programme stands. */
export const ProgrammeRunStateSchema = z.enum(['starting', 'running', 'paused', 'finished', 'failed', 'aborted']);
export type ProgrammeRunState = z.infer<typeof ProgrammeRunStateSchema>;

/** A run's programme as the API returns it: the steps it follows, where it is, and each finished step's figures. */
export const RunProgrammeSchema = z.object({
  runId: z.number().int(),
  programmeId: z.number().int().nullable(),
  /** The programme as it was when the run started (a later edit does not change this run). */
  programme: ProgrammeInputSchema,
  /** The unrolled steps' labels, in order. */
  stepLabels: z.array(z.string()),
  state: ProgrammeRunStateSchema,
  currentIndex: z.number().int().nonnegative().nullable(),
  /** Server clock (ms since 1970) the current step started, less any paused time; null when none runs. */
  stepStartedAtMs: z.number().nullable(),
  /** Server clock now, so a browser can show time in step without trusting its own clock. */
  serverNowMs: z.number(),
  results: z.array(StepResultSchema),
  roundTrips: z.array(RoundTripPairSchema),
  failReason: z.string().nullable(),
  /** The safety floor the server stops a discharge at, pack volts. */
  floorVolts: finite,
  /** Instruments whose own watchdog was armed. */
  watchdogArmed: z.array(z.string()),
  cautionsAcknowledgedBy: z.string().nullable(),
});
export type RunProgramme = z.infer<typeof RunProgrammeSchema>;

/** POST /api/runs/:id/programme: follow a saved programme; the cautions must be acknowledged. */
export const StartProgrammeRequestSchema = z.object({
  programmeId: z.number().int().positive(),
  acknowledgeCautions: z.literal(true, { message: 'Read and acknowledge the cautions before a programme starts' }),
});

/** POST /api/runs/:id/programme/control: a technician's hand on the current step. */
export const ProgrammeControlRequestSchema = z.object({
  action: z.enum(['pause', 'resume', 'skip', 'abort']),
});
export type ProgrammeControlAction = z.infer<typeof ProgrammeControlRequestSchema>['action'];

/** One instrument exchange as the command log shows it. */
export const CommandLogRowSchema = z.object({
  atMs: z.number(),
  instrumentId: z.string(),
  sent: z.string(),
  reply: z.string().nullable(),
  problem: z.string().nullable(),
});
export type CommandLogRow = z.infer<typeof CommandLogRowSchema>;

/**
 * The cautions shown before a programme starts, acknowledged by the technician. Words of our
 * own on the usual hazards (common practice of bench work with batteries).
 */
export const PROGRAMME_CAUTIONS: readonly string[] = [
  'An unattended test can fail in ways the server cannot see: check the bench before you leave it, and keep a way to cut power that works without this software.',
  "Keep the pack's own protection (BMS) and thermal cutoffs in place: the server's limits are a second line, not the only one.",
  'Fuse the pack close to its terminals for the highest current of the programme, and size every cable and connector for that current.',
  'Lithium packs can burn and lead-acid batteries give off hydrogen while charging: test in a ventilated place away from anything that burns, with the means to deal with a battery fire at hand.',
  'Follow local codes, the makers\u2019 instructions for the pack, the load and the charger, and licensed practice where the work needs it.',
  'A load or charger without a watchdog of its own can stay on while the server is down: the server switches it off only when it starts again, and an instrument it cannot reach stays as it was.',
];
