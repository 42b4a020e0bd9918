import { z } from 'zod';
import { labelText, noteText } from './text.js';
import {
  EndVoltsSchema,
  RunAlarmsSchema,
  RunKindSchema,
  RunSchema,
  RunStateSchema,
  StopWhenSchema,
} from './run.js';
import { RunEventSchema } from './run-event.js';
import { LEGACY_ANNOTATE_KEYS, withCurrentKeys } from './legacy-keys.js';
import { TempProtectionSchema } from './measure-config.js';
import { PROTECTIONS, ProtectionRequestSchema } from './protection-check.js';
import { RunSummarySchema } from './run-summary.js';

const id = z.coerce.number().int().positive();
/** Longest gap limit a run or import may ask for: one day, s. */
export const MAX_GAP_LIMIT_SECONDS = 86_400;
/** Electrolyte temperatures a lab could meet at all (the correction itself covers a narrower table range). */
const ELECTROLYTE_CELSIUS = { min: -40, max: 80 } as const;
const tags = z.array(labelText(50)).max(30);
/** A run's tags as every route accepts them (the import splits its comma-separated field into this). */
export const RunTagsSchema = tags;

/** POST /api/runs — start a run on a bench (technician). */
export const StartRunRequestSchema = z
  .object({
    benchId: z.number().int().positive(),
    batteryId: z.number().int().positive(),
    name: labelText(200),
    tags: tags.default([]),
    kind: RunKindSchema.default('capacity-discharge'),
    endVolts: EndVoltsSchema.nullable().default(null),
    acceptancePercent: z.number().finite().positive().max(1000).default(100),
    alarms: RunAlarmsSchema.default({ onCutoff: true }),
    stopWhen: StopWhenSchema.default('after-recovery'),
    tempProtections: z.array(TempProtectionSchema).max(8).default([]),
    /**
     * Protection check: the protections to time. A threshold left out comes from the pack's record;
     * none listed on a protection check = every protection the pack's record states.
     */
    protectionChecks: z.array(ProtectionRequestSchema).max(PROTECTIONS.length).default([]),
    targetAh: z.number().finite().positive().nullable().default(null),
    targetWh: z.number().finite().positive().nullable().default(null),
    afterRecoverySeconds: z.number().finite().nonnegative().max(86_400).default(0),
    /** A protection trip ends the test even when the pack reconnects (default: the test runs on to the end voltage). */
    protectionEndsTest: z.boolean().optional(),
    /** Gap limit, s: a silence longer than this is a gap. Null = 3 × the bench's poll period, else 30 s. */
    maxGapSeconds: z.number().finite().positive().max(MAX_GAP_LIMIT_SECONDS).nullable().optional(),
    /** Lead-acid: initial electrolyte temperature, °C, for the correction to 25 °C (IEEE 450). */
    electrolyteTempCelsius: z.number().finite().min(ELECTROLYTE_CELSIUS.min).max(ELECTROLYTE_CELSIUS.max).nullable().optional(),
  })
  .refine((r) => r.stopWhen !== 'target-ah' || r.targetAh !== null, {
    message: 'targetAh is required when stopWhen is target-ah',
    path: ['targetAh'],
  })
  .refine((r) => r.stopWhen !== 'target-wh' || r.targetWh !== null, {
    message: 'targetWh is required when stopWhen is target-wh',
    path: ['targetWh'],
  })
  .refine((r) => r.protectionChecks.length === 0 || r.kind === 'protection-check', {
    message: 'Protections are checked on a protection-check run: set kind to protection-check',
    path: ['protectionChecks'],
  });
export type StartRunRequest = z.input<typeof StartRunRequestSchema>;

/** POST /api/runs/:id/stop — `abort: true` ends the run as aborted instead of finished. */
export const StopRunRequestSchema = z.object({ abort: z.boolean().default(false) });

/** PATCH /api/runs/:id — rename or retag. */
export const PatchRunRequestSchema = z
  .object({ name: labelText(200).optional(), tags: tags.optional() })
  .refine((p) => p.name !== undefined || p.tags !== undefined, { message: 'nothing to change' });

/** GET /api/runs query: every filter optional, `q` searches the name. */
export const ListRunsQuerySchema = z.object({
  q: z.string().max(200).optional(),
  tag: z.string().max(50).optional(),
  batteryId: id.optional(),
  benchId: id.optional(),
  state: RunStateSchema.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export type ListRunsQuery = z.infer<typeof ListRunsQuerySchema>;

export const ListRunsResponseSchema = z.object({ runs: z.array(RunSchema), total: z.number().int() });
export type ListRunsResponse = z.infer<typeof ListRunsResponseSchema>;

/** GET /api/runs/:id and the answers to start/stop/patch. */
export const RunResponseSchema = z.object({ run: RunSchema });
export type RunResponse = z.infer<typeof RunResponseSchema>;

/** The x axis of a readings answer: run time (`elapsedSeconds`), delivered Ah (`ah`) or delivered Wh (`wh`). */
export const ReadingsAxisSchema = z.enum(['elapsedSeconds', 'ah', 'wh']);
export type ReadingsAxis = z.infer<typeof ReadingsAxisSchema>;

/** GET /api/runs/:id/readings — window in the unit of the x axis; maxPoints = buckets. */
export const ReadingsQuerySchema = z.object({
  from: z.coerce.number().finite().optional(),
  to: z.coerce.number().finite().optional(),
  maxPoints: z.coerce.number().int().min(10).max(20_000).default(1000),
  /** x axis; `from`/`to` are in its unit. `x=t` (run time before the rename) is still taken, deprecated. */
  x: z.preprocess((v) => (v === 't' ? 'elapsedSeconds' : v), ReadingsAxisSchema).default('elapsedSeconds'),
});
export type ReadingsQuery = z.infer<typeof ReadingsQuerySchema>;

const column = z.array(z.number().nullable());
/** min and max of one channel per bucket (equal at full resolution); null = no reading (a gap). */
export const MinMaxColumnSchema = z.object({ min: column, max: column });

/**
 * Columnar history. `x` = each bucket's start on the x axis (or the reading's own position at
 * full resolution): run seconds, delivered Ah or delivered Wh as `axis` says. Channels: volts,
 * amps, watts and one per temperature.
 */
export const ReadingsResponseSchema = z.object({
  runId: z.number().int(),
  /** The x axis of `x`, `from`, `to` and `bucketSeconds`: run seconds, delivered Ah or delivered Wh. */
  axis: ReadingsAxisSchema,
  from: z.number(),
  to: z.number(),
  /** false = every reading in the window, true = min/max buckets of `bucketSeconds`. */
  reduced: z.boolean(),
  bucketSeconds: z.number().nullable(),
  readingsInWindow: z.number().int(),
  x: z.array(z.number()),
  volts: MinMaxColumnSchema,
  amps: MinMaxColumnSchema,
  watts: MinMaxColumnSchema,
  temps: z.record(z.string(), MinMaxColumnSchema),
});
export type ReadingsResponse = z.infer<typeof ReadingsResponseSchema>;

/** POST /api/runs/:id/events — an annotation at a run time (technician). */
/** PATCH /api/runs/:id/events/:eventId: a note's new text (its author or an admin). */
export const EditNoteRequestSchema = z.object({ text: z.string().trim().min(1).max(2000) });

/** One change to a note: what it said before and after (null: removed), who and when. */
export const NoteRevisionSchema = z.object({
  id: z.number().int(),
  runId: z.number().int(),
  eventId: z.number().int(),
  action: z.enum(['edited', 'removed']),
  /** Run time of the note, s. */
  elapsedSeconds: z.number(),
  previousText: z.string(),
  newText: z.string().nullable(),
  changedBy: z.number().int().nullable(),
  changedByName: z.string(),
  changedAt: z.string(),
});
export type NoteRevision = z.infer<typeof NoteRevisionSchema>;
/** GET /api/runs/:id/note-history */
export const NoteHistoryResponseSchema = z.object({ revisions: z.array(NoteRevisionSchema) });

/**
 * POST /api/runs/:id/events body. `elapsedSeconds`: run time of the note, s; default the latest
 * reading's. Old clients send it as `t` (deprecated): taken as `elapsedSeconds` when that is absent.
 */
export const AnnotateRequestSchema = z.preprocess(
  (body) => withCurrentKeys(body, LEGACY_ANNOTATE_KEYS),
  z.object({
    elapsedSeconds: z.number().finite().nonnegative().optional(),
    text: noteText(2000, 1),
  }),
);

/** A stored event: the RunEvent plus its database id and when it was written. */
export const StoredRunEventSchema = z.object({
  id: z.number().int(),
  runId: z.number().int(),
  event: RunEventSchema,
  createdAt: z.string(),
  /** Who wrote it (notes); null for the detector's events. */
  createdBy: z.number().int().nullable().optional(),
});
export type StoredRunEvent = z.infer<typeof StoredRunEventSchema>;
export const RunEventsResponseSchema = z.object({ events: z.array(StoredRunEventSchema) });

/**
 * How imported current is signed in the file. `auto`: the direction with the lower mean
 * voltage (Wh per Ah) is discharge; with current one way only, falling voltage is discharge;
 * when neither tells, the import is refused and asks for the sign.
 */
export const ImportCurrentSignSchema = z.enum(['discharge-positive', 'discharge-negative', 'auto']);

/**
 * How a log writes its time: seconds, ms, minutes, hours (numbers since the logger's zero or
 * since 1970), `h:mm:ss`, ISO 8601, day-first (dd.mm.yyyy) or month-first (mm/dd/yyyy) dates,
 * or spreadsheet serial days. Dates without a zone are the lab's wall-clock time.
 */
export const ImportTimeFormatSchema = z.enum(['s', 'ms', 'min', 'h', 'hms', 'iso', 'dmy', 'mdy', 'serial-days']);
export type ImportTimeFormat = z.infer<typeof ImportTimeFormatSchema>;
/** Unit of a temperature column whose header names none. */
export const ImportTempUnitSchema = z.enum(['C', 'F', 'K']);

/** Optional column mapping for an import: header names in the file for each channel. */
export const ImportColumnMapSchema = z.object({
  time: z.string().min(1).optional(),
  volts: z.string().min(1).optional(),
  amps: z.string().min(1).optional(),
  temp: z.string().min(1).optional(),
  /** Format of the time column (the same as the `timeFormat` field, which wins). */
  timeUnit: ImportTimeFormatSchema.optional(),
});


/** Multipart fields of POST /api/runs/import (the CSV is the `file` part). */
/** A client-chosen name for one import's progress: letters, digits, - and _ (a UUID fits). */
export const ImportProgressIdSchema = z.string().regex(/^[A-Za-z0-9_-]{8,64}$/);

export const ImportFieldsSchema = z.object({
  name: labelText(200),
  batteryId: z.coerce.number().int().positive().optional(),
  endVolts: z.coerce.number().finite().positive().optional(),
  currentSign: ImportCurrentSignSchema.default('auto'),
  tags: z.string().max(1000).optional(),
  /** JSON text of ImportColumnMap. */
  columns: z.string().max(2000).optional(),
  /** Time format; omitted: from the header's unit mark or the values (refused when they cannot tell). */
  timeFormat: ImportTimeFormatSchema.optional(),
  /** Unit of a temperature column whose header names none; omitted: the lab's unit. */
  tempUnit: ImportTempUnitSchema.optional(),
  /** Share of rated capacity to pass, %; omitted: the lab's setting. */
  acceptancePercent: z.coerce.number().finite().min(1).max(100).optional(),
  /** Lead-acid: initial electrolyte temperature, °C, for the correction to 25 °C. */
  electrolyteTempCelsius: z.coerce.number().finite().min(ELECTROLYTE_CELSIUS.min).max(ELECTROLYTE_CELSIUS.max).optional(),
  /** A step longer than this is a gap, seconds; omitted: judged against the file's median interval. */
  maxGapSeconds: z.coerce.number().finite().positive().max(MAX_GAP_LIMIT_SECONDS).optional(),
  /** The client's name for this import, to ask GET /api/runs/import/progress/:progressId how far it got. */
  progressId: ImportProgressIdSchema.optional(),
});

/** How far an import has got on the server: every row checked first, then imported (GET /api/runs/import/progress/:progressId). */
export const ImportProgressSchema = z.object({
  phase: z.enum(['checking', 'importing']),
  /** Rows done in this phase. */
  rows: z.number().int().nonnegative(),
  /** Rows in the file, known once the check is done (null while checking). */
  totalRows: z.number().int().nonnegative().nullable(),
});
export type ImportProgress = z.infer<typeof ImportProgressSchema>;

/** The short summary the import answers with. */
export const ImportSummarySchema = z.object({
  energyWh: z.number(),
  dischargeAh: z.number(),
  durationSeconds: z.number(),
  cutoff: z.object({ atSeconds: z.number(), volts: z.number() }).nullable(),
  recoverySeconds: z.number().nullable(),
  percentOfRated: z.number().nullable().optional(),
  rows: z.number().int(),
  /** Rows whose time repeats the row before (kept: the first of each; the lines of the first ten named). */
  duplicateTimes: z.object({ count: z.number().int(), lines: z.array(z.number().int()) }).optional(),
  /** The file's cadence: median step between distinct times, seconds. */
  medianIntervalSeconds: z.number().nullable().optional(),
  /** The gap limit used, seconds. */
  maxGapSeconds: z.number().optional(),
  /** What the importer decided or assumed, in words (time format, temperature unit, current sign, duplicates). */
  notices: z.array(z.string()).optional(),
});
export const ImportResponseSchema = z.object({
  run: RunSchema,
  summary: ImportSummarySchema,
  fullSummary: RunSummarySchema,
});
export type ImportResponse = z.infer<typeof ImportResponseSchema>;
