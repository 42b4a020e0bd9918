import { z } from 'zod';
import { BenchStatusSchema } from './bench.js';
import { AnnotationEventSchema, RunEventSchema } from './run-event.js';
import { RunSchema } from './run.js';

/**
 * WebSocket messages on /ws. Readings of each topic are numbered (`seq`, one counter per
 * topic stream); snapshots and batches carry the number of the last reading they account
 * for, and a client that reconnects sends it back as its cursor to get exactly what it missed.
 */

/** What a client can listen to: a bench's raw frames, or a run's integrated readings. */
export const TopicSchema = z.object({
  kind: z.enum(['bench', 'run']),
  id: z.number().int().positive(),
});
export type Topic = z.infer<typeof TopicSchema>;

/** A stable string key for a topic ("bench:3", "run:12"). */
export function topicKey(topic: Topic): string {
  return `${topic.kind}:${topic.id}`;
}

/** Longest stream id the server hands out; a longer one in a cursor is refused. */
const MAX_STREAM_ID_LENGTH = 64;

/**
 * Where a client stands in a topic's readings: the topic's stream (it changes when the server
 * restarts or forgets the topic) and the `seq` of the last reading the client accounted for.
 */
export const ReadingCursorSchema = z.object({
  stream: z.string().min(1).max(MAX_STREAM_ID_LENGTH),
  seq: z.number().int().nonnegative(),
});
export type ReadingCursor = z.infer<typeof ReadingCursorSchema>;

// ---- client → server ----
export const ClientMessageSchema = z.discriminatedUnion('type', [
  /** `after`: the cursor of a reconnecting client; the snapshot then holds only what it missed. */
  z.object({ type: z.literal('subscribe'), topic: TopicSchema, after: ReadingCursorSchema.optional() }),
  z.object({ type: z.literal('unsubscribe'), topic: TopicSchema }),
  z.object({ type: z.literal('ping'), id: z.number().int().nonnegative().optional() }),
]);
export type ClientMessage = z.infer<typeof ClientMessageSchema>;

// ---- server → client ----
const num = z.number();
/** The columns every topic's readings carry, beside its time column. */
const readingColumnsBase = {
  volts: z.array(num),
  amps: z.array(num),
  watts: z.array(num),
  temps: z.record(z.string(), z.array(num.nullable())),
  dischargeWh: z.array(num).optional(),
  dischargeAh: z.array(num).optional(),
  chargeWh: z.array(num).optional(),
  chargeAh: z.array(num).optional(),
};

/**
 * Readings as columns (all arrays have the same length). The time column is exactly one of
 * two: `elapsedSeconds` (run time, s since the run's origin) on a run topic, `t` (source time,
 * the meter's own clock) on a bench topic. The totals columns are present on run topics only.
 * `temps` holds one column per temperature channel (null when a reading lacks that channel).
 */
export const ReadingColumnsSchema = z.union([
  z.object({ elapsedSeconds: z.array(num), t: z.never().optional(), ...readingColumnsBase }),
  z.object({ t: z.array(num), elapsedSeconds: z.never().optional(), ...readingColumnsBase }),
]);
export type ReadingColumns = z.infer<typeof ReadingColumnsSchema>;

/** The time column of readings: `elapsedSeconds` on a run topic, `t` (source time) on a bench topic. */
export function timeColumn(cols: ReadingColumns): number[] {
  return cols.elapsedSeconds !== undefined ? cols.elapsedSeconds : cols.t;
}

/** Number of the last reading a snapshot or batch accounts for in its topic's stream (0 = none yet). */
const seq = z.number().int().nonnegative();

/**
 * How a snapshot's `recent` relates to the cursor of the subscribe: `fresh` (no cursor: the
 * last readings), `resumed` (exactly the readings after the cursor, nothing repeated or
 * missing) or `refetch` (the cursor is older than the server keeps, or of another stream:
 * the last readings, and the client fetches the history it missed from the archive).
 */
export const SnapshotResumeSchema = z.enum(['fresh', 'resumed', 'refetch']);
export type SnapshotResume = z.infer<typeof SnapshotResumeSchema>;

export const HelloMessageSchema = z.object({
  type: z.literal('hello'),
  /** Server clock (Unix ms) so the client can show how old a reading is. */
  serverTimeMs: num,
  user: z.object({ id: z.number().int(), role: z.enum(['admin', 'technician', 'viewer']) }),
});

/**
 * Sent once after each subscribe: the current state and the last few readings. `run` is the
 * run itself on a run topic, and on a bench topic the run live on that bench (armed to
 * recovered) or null when nothing records there.
 */
export const SnapshotMessageSchema = z.object({
  type: z.literal('snapshot'),
  /** The topic's stream id, for the client's cursor. */
  stream: ReadingCursorSchema.shape.stream,
  seq,
  resume: SnapshotResumeSchema,
  topic: TopicSchema,
  status: BenchStatusSchema.nullable(),
  run: RunSchema.nullable(),
  recent: ReadingColumnsSchema,
  events: z.array(RunEventSchema),
});

/**
 * At most one per topic every 100 ms. `dropped` = readings thinned away for this client since
 * the last batch; `seq` counts them too (they are accounted for, not owed).
 */
export const BatchMessageSchema = z.object({
  type: z.literal('batch'),
  seq,
  topic: TopicSchema,
  readings: ReadingColumnsSchema,
  dropped: z.number().int().nonnegative(),
});

/** A run event; never dropped, whatever the back-pressure. */
export const EventMessageSchema = z.object({
  type: z.literal('event'),
  topic: TopicSchema,
  /** Database id of the stored event (null while the archive is catching up). */
  eventId: z.number().int().nullable(),
  event: RunEventSchema,
});

/**
 * A note on a run was edited (`event` holds the new text) or removed (`event` null); never
 * dropped. `previous` is the note as viewers had it, so a screen without ids can find it.
 */
export const NoteChangeMessageSchema = z.object({
  type: z.literal('note'),
  topic: TopicSchema,
  eventId: z.number().int(),
  previous: AnnotationEventSchema,
  event: AnnotationEventSchema.nullable(),
});
export type NoteChangeMessage = z.infer<typeof NoteChangeMessageSchema>;

/**
 * A run started, changed state (armed → recording → cutoff → …) or its name/tags/summary
 * changed. Sent on the run's topic and on its bench's topic (`topic` says which).
 */
export const RunMessageSchema = z.object({ type: z.literal('run'), topic: TopicSchema, run: RunSchema });

/** A bench's source status changed. */
export const StatusMessageSchema = z.object({
  type: z.literal('status'),
  topic: TopicSchema,
  status: BenchStatusSchema,
});

export const ErrorMessageSchema = z.object({
  type: z.literal('error'),
  message: z.string(),
  /** Present when the error is about one topic (unknown bench, no such run). */
  topic: TopicSchema.optional(),
});

export const PongMessageSchema = z.object({
  type: z.literal('pong'),
  id: z.number().int().nonnegative().optional(),
  serverTimeMs: num,
});

export const ServerMessageSchema = z.discriminatedUnion('type', [
  HelloMessageSchema,
  SnapshotMessageSchema,
  BatchMessageSchema,
  EventMessageSchema,
  NoteChangeMessageSchema,
  RunMessageSchema,
  StatusMessageSchema,
  ErrorMessageSchema,
  PongMessageSchema,
]);
export type ServerMessage = z.infer<typeof ServerMessageSchema>;
export type HelloMessage = z.infer<typeof HelloMessageSchema>;
export type SnapshotMessage = z.infer<typeof SnapshotMessageSchema>;
export type BatchMessage = z.infer<typeof BatchMessageSchema>;
export type EventMessage = z.infer<typeof EventMessageSchema>;

/** Longest client message the server reads; anything larger closes the socket. */
export const MAX_CLIENT_MESSAGE_BYTES = 4096;
