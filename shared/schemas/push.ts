import { z } from 'zod';

/** Longest push endpoint URL we store (push services use a few hundred characters). */
const MAX_ENDPOINT_CHARS = 1000;

/** True for an https URL (web-push only speaks https). */
function isPushEndpoint(text: string): boolean {
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    return false;
  }
  return url.protocol === 'https:';
}

/** A browser's PushSubscription as PushSubscription.toJSON() gives it (https endpoints only). */
export const PushSubscriptionInputSchema = z.object({
  endpoint: z.string().max(MAX_ENDPOINT_CHARS).refine(isPushEndpoint, 'the push endpoint must be an https URL'),
  expirationTime: z.number().nullable().optional(),
  keys: z.object({
    /** The browser's P-256 public key, base64url (65 bytes uncompressed = 87 characters). */
    p256dh: z.string().regex(/^[A-Za-z0-9_-]{80,100}$/, 'a base64url P-256 public key'),
    /** The 16-byte auth secret, base64url (22 characters). */
    auth: z.string().regex(/^[A-Za-z0-9_-]{16,32}$/, 'a base64url auth secret'),
  }).strict(),
}).strict();
export type PushSubscriptionInput = z.infer<typeof PushSubscriptionInputSchema>;

/** Removing one subscription: the browser names its endpoint. */
export const PushUnsubscribeSchema = z.object({ endpoint: z.string().max(MAX_ENDPOINT_CHARS) }).strict();

/** The push service's acknowledge-by-token body (from the service worker). */
export const PushAcknowledgeSchema = z.object({ alarmId: z.number().int().positive(), token: z.string().max(200) }).strict();

/**
 * What a push message carries (JSON, encrypted aes128gcm): the same facts as the alarm e-mail
 * (bench, pack, the values as the lab writes them, the run link) and the acknowledge action.
 */
export const PushPayloadSchema = z.object({
  alarmId: z.number().int(),
  /** 0 = the first notice, 1, 2, … = reminders (the service worker alerts again only for a new step). */
  step: z.number().int().nonnegative(),
  kind: z.string(),
  priority: z.string(),
  title: z.string(),
  body: z.string(),
  bench: z.string(),
  pack: z.string(),
  run: z.string(),
  /** [label, formatted value] rows, identical to the e-mail's. */
  values: z.array(z.tuple([z.string(), z.string()])),
  runUrl: z.string(),
  ackUrl: z.string(),
  /** POST here with {alarmId, token}: needs no session cookie or CSRF token. */
  ackApiUrl: z.string(),
  ackToken: z.string(),
});
export type PushPayload = z.infer<typeof PushPayloadSchema>;
