import { z } from 'zod';
import { RunSummarySchema } from './run-summary.js';

/** Longest comment on a sign-off or a ready-for-review mark. */
export const SIGNOFF_COMMENT_MAX_CHARS = 2000;

/** What a person did: marked the run ready for review, or signed it off. */
export const SignoffActionSchema = z.enum(['ready', 'signed']);
export type SignoffAction = z.infer<typeof SignoffActionSchema>;

/**
 * Where a run stands: `none` (never marked), `ready` (waiting for an admin), `signed` (the
 * latest sign-off still matches the run), `superseded` (signed once, changed since: it needs
 * a new sign-off).
 */
export const ReviewStatusSchema = z.enum(['none', 'ready', 'signed', 'superseded']);
export type ReviewStatus = z.infer<typeof ReviewStatusSchema>;

/** One note as frozen in a sign-off. */
export const SnapshotNoteSchema = z.object({ eventId: z.number().int(), elapsedSeconds: z.number(), text: z.string(), author: z.string().nullable() });

/**
 * The signed result, frozen: the run's identity and settings, its summary (verdict and
 * protection results included), its notes, and the change markers (the run's last update,
 * how many note edits) that make any later change show.
 */
export const RunSnapshotSchema = z.object({
  runId: z.number().int(),
  name: z.string(),
  tags: z.array(z.string()),
  kind: z.string(),
  state: z.string(),
  batteryId: z.number().int().nullable(),
  startedAt: z.string().nullable(),
  endedAt: z.string().nullable(),
  endVolts: z.unknown(),
  acceptancePercent: z.number(),
  summary: RunSummarySchema.nullable(),
  notes: z.array(SnapshotNoteSchema),
  changeMarkers: z.object({ runUpdatedAt: z.string(), noteRevisionCount: z.number().int() }),
});
export type RunSnapshot = z.infer<typeof RunSnapshotSchema>;

/** One entry of a run's review history, as the API shows it. */
export const SignoffEntrySchema = z.object({
  id: z.number().int(),
  runId: z.number().int(),
  action: SignoffActionSchema,
  comment: z.string(),
  /** SHA-256 (hex) of the canonical JSON of the run's snapshot at that moment. */
  contentHash: z.string(),
  byId: z.number().int().nullable(),
  byName: z.string(),
  byRole: z.string(),
  at: z.string(),
  /** `current`: still what the run says; `superseded`: the run changed or a newer entry replaced it. */
  state: z.enum(['current', 'superseded']),
});
export type SignoffEntry = z.infer<typeof SignoffEntrySchema>;

/** GET /api/runs/:id/signoffs: where the run stands and every entry, newest first. */
export const SignoffHistoryResponseSchema = z.object({
  status: ReviewStatusSchema,
  currentHash: z.string(),
  entries: z.array(SignoffEntrySchema),
});
export type SignoffHistoryResponse = z.infer<typeof SignoffHistoryResponseSchema>;

/**
 * GET /api/runs/:id/signoffs/:signoffId: one entry with what was frozen. `verified`: the frozen
 * snapshot as stored still hashes to the entry's `contentHash`.
 */
export const SignoffDetailResponseSchema = z.object({ entry: SignoffEntrySchema, snapshot: RunSnapshotSchema, verified: z.boolean() });

/** POST /api/runs/:id/signoffs/ready (technician or admin). */
export const MarkReadyRequestSchema = z.strictObject({ comment: z.string().trim().max(SIGNOFF_COMMENT_MAX_CHARS).default('') });

/**
 * POST /api/runs/:id/signoffs (admin). `contentHash`, when given, must be the run's current
 * hash: the admin signs what they looked at, not a change made meanwhile.
 */
export const SignRequestSchema = z.strictObject({
  comment: z.string().trim().min(1, 'a sign-off needs a comment').max(SIGNOFF_COMMENT_MAX_CHARS),
  contentHash: z.string().regex(/^[0-9a-f]{64}$/).optional(),
});

/** The sign-off block a report shows: the current signature, or why there is none. */
export const SignoffBlockSchema = z.object({
  status: ReviewStatusSchema,
  signed: SignoffEntrySchema.nullable(),
  /** Every earlier sign-off that no longer holds, newest first (kept, never changed). */
  earlier: z.array(SignoffEntrySchema).optional(),
});
export type SignoffBlock = z.infer<typeof SignoffBlockSchema>;
