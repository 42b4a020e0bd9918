import { z } from 'zod';
import { BenchSourceConfigSchema, BenchStatusSchema } from './bench.js';
import { FrameSchema } from './frame.js';

/**
 * Bench gateways: small PCs beside benches that run the benches' sources and publish what
 * they read to an MQTT broker; the server subscribes and records those benches like its own.
 * These are the messages on the wire (JSON, validated where they arrive) and the API shapes.
 */

/** A gateway's name: its MQTT user name and client id are made from it, so topic-safe characters only. */
export const GatewayNameSchema = z
  .string()
  .trim()
  .regex(/^[a-z0-9][a-z0-9-]{0,39}$/, { message: 'lower-case letters, digits and - (at most 40, starting with a letter or digit)' });

/**
 * One message on a bench's feed topic, in the order the gateway produced it. `seq` counts per
 * bench from 1 across frames and status changes and survives the gateway's restarts, so the
 * server drops a QoS 1 redelivery (seq at or below the last taken) and sees a loss as a jump.
 * `atMs` is the gateway's clock when the message was made (not when it was sent).
 */
export const FeedMessageSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('frame'), seq: z.number().int().positive(), atMs: z.number().finite(), frame: FrameSchema }),
  z.object({ type: z.literal('status'), seq: z.number().int().positive(), atMs: z.number().finite(), status: BenchStatusSchema }),
]);

/**
 * A gateway's own state, retained on its state topic: published when it connects and then
 * every few seconds, and (`online: false`) by the broker as its last will.
 */
export const GatewayStateMessageSchema = z.object({
  online: z.boolean(),
  /** The gateway's clock when it published this, ms since the epoch (absent in the last will). */
  atMs: z.number().finite().optional(),
  /** Messages in its outbox not yet acknowledged by the broker. */
  outboxDepth: z.number().int().nonnegative().optional(),
  /** Benches it runs. */
  benchIds: z.array(z.number().int().positive()).optional(),
});

/** One bench a gateway runs: the same source configuration a local bench has. */
export const GatewayBenchSchema = z.object({
  id: z.number().int().positive(),
  source: BenchSourceConfigSchema,
  enabled: z.boolean(),
});

/** What the server tells a gateway to run (retained on the gateway's config topic). */
export const GatewayConfigMessageSchema = z.object({
  benches: z.array(GatewayBenchSchema),
});

/** A gateway as the board and admin pages see it. */
export const GatewaySchema = z.object({
  id: z.number().int().positive(),
  name: GatewayNameSchema,
  /** The MQTT user name it signs in to the broker with. */
  username: z.string(),
  revoked: z.boolean(),
  benchIds: z.array(z.number().int().positive()),
  createdAt: z.string(),
  state: z.object({
    online: z.boolean(),
    /** ISO time the server last heard from it. */
    lastSeenAt: z.string().nullable(),
    /**
     * Its clock minus the server's, ms, from its latest state message (the time in transit
     * makes it read low by that much). Null: not heard.
     */
    clockOffsetMs: z.number().nullable(),
    /** Messages waiting in its on-disk outbox when it last reported. */
    outboxDepth: z.number().int().nonnegative().nullable(),
  }),
});

export const CreateGatewayRequestSchema = z.object({ name: GatewayNameSchema });
export const AssignBenchesRequestSchema = z.object({ benchIds: z.array(z.number().int().positive()).max(1000) });

export const GatewayListResponseSchema = z.object({ gateways: z.array(GatewaySchema), mqtt: z.boolean() });
export const GatewayResponseSchema = z.object({ gateway: GatewaySchema });
/** The answer to a registration: the password appears here once and is never shown again. */
export const GatewayCreatedResponseSchema = z.object({ gateway: GatewaySchema, password: z.string() });

export type FeedMessage = z.infer<typeof FeedMessageSchema>;
export type GatewayStateMessage = z.infer<typeof GatewayStateMessageSchema>;
export type GatewayBench = z.infer<typeof GatewayBenchSchema>;
export type GatewayConfigMessage = z.infer<typeof GatewayConfigMessageSchema>;
export type Gateway = z.infer<typeof GatewaySchema>;
export type GatewayListResponse = z.infer<typeof GatewayListResponseSchema>;
