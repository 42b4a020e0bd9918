import { z } from 'zod';
import { BenchStatusSchema } from './bench.js';
import { AnnotationEventSchema, RunEventSchema } from './run-event.js';
import { RunSchema } from './run.js';

/**
 * WebSocket messages on /ws. Every server message carries `seq`, one counter per
 * connection, so a client can tell whether it missed anything after a reconnect.
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

// ---- client → server ----
export const ClientMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('subscribe'), topic: TopicSchema }),
  z.object({ type: z.literal('unsubscribe'), topic: TopicSchema }),
  z.object({ type: z.literal('ping'), id: z.number().int().nonnegative().optional() }),
]);
export type ClientMessage = z.infer<typeof ClientMessageSchema>;

// ---- server → client ----
const num = z.number();
/**
 * Readings as columns (all arrays have the same length). `t` is the source time for a
 * bench topic and seconds since the run started for a run topic. The totals columns are
 * present on run topics only. `temps` holds one column per temperature channel (null
 * when a reading lacks that channel).
 */
export const ReadingColumnsSchema = z.object({
  t: z.array(num),
  volts: z.array(num),
  amps: z.array(num),
  watts: z.array(num),
  temps: z.record(z.string(), z.array(num.nullable())),
  dischargeWh: z.array(num).optional(),
  dischargeAh: z.array(num).optional(),
  chargeWh: z.array(num).optional(),
  chargeAh: z.array(num).optional(),
});
export type ReadingColumns = z.infer<typeof ReadingColumnsSchema>;

const seq = z.number().int().nonnegative();

export const HelloMessageSchema = z.object({
  type: z.literal('hello'),
  seq,
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
  seq,
  topic: TopicSchema,
  status: BenchStatusSchema.nullable(),
  run: RunSchema.nullable(),
  recent: ReadingColumnsSchema,
  events: z.array(RunEventSchema),
});

/** At most one per topic every 100 ms. `dropped` = readings thinned away for this client since the last batch. */
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
  seq,
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
  seq,
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
export const RunMessageSchema = z.object({ type: z.literal('run'), seq, topic: TopicSchema, run: RunSchema });

/** A bench's source status changed. */
export const StatusMessageSchema = z.object({
  type: z.literal('status'),
  seq,
  topic: TopicSchema,
  status: BenchStatusSchema,
});

export const ErrorMessageSchema = z.object({
  type: z.literal('error'),
  seq,
  message: z.string(),
  /** Present when the error is about one topic (unknown bench, no such run). */
  topic: TopicSchema.optional(),
});

export const PongMessageSchema = z.object({
  type: z.literal('pong'),
  seq,
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
