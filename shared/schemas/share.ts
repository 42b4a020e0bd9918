import { z } from 'zod';
import { StoredRunEventSchema } from './api-runs.js';
import { BatterySchema } from './battery.js';
import { InspectionItemSchema, InspectionRatingSchema } from './inspection.js';
import { ProtectionResultSchema } from './protection-check.js';
import { RunSchema } from './run.js';
import { ProtectionTripSchema, RunSummarySchema, VerdictSchema } from './run-summary.js';
import { SignoffBlockSchema } from './signoff.js';

/** A link lives 30 days unless its maker chooses otherwise. */
export const SHARE_DEFAULT_DAYS = 30;
/** The longest a link may live. */
export const SHARE_MAX_DAYS = 365;

/** What a link shows: one run's report or one pack's report. */
export const ShareTargetKindSchema = z.enum(['run', 'battery']);
export type ShareTargetKind = z.infer<typeof ShareTargetKindSchema>;

/** POST /api/share-links (technician or admin). */
export const CreateShareLinkRequestSchema = z.strictObject({
  kind: ShareTargetKindSchema,
  targetId: z.number().int().positive(),
  expiresInDays: z.number().int().min(1).max(SHARE_MAX_DAYS).default(SHARE_DEFAULT_DAYS),
  /** Show the pack's price and the cost per kWh; off unless chosen. */
  includePrices: z.boolean().default(false),
  /** Who the link is for, as a reminder in the list (never shown on the shared page). */
  recipient: z.string().trim().max(200).optional(),
});
export type CreateShareLinkRequest = z.input<typeof CreateShareLinkRequestSchema>;

/** Longest note a technician adds to a share link e-mail. */
export const SHARE_MAIL_MESSAGE_MAX_CHARS = 2000;

/**
 * An address a mail may go to: a plain e-mail address (RFC 5321's 254-character limit), no
 * display name, and none of the characters that could end a header or add a recipient
 * (CR, LF and other controls, `<`, `>`, `"`, `,`, `;`, `\`).
 */
export const MailAddressSchema = z
  .email('an e-mail address such as client@example.com')
  .max(254)
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused
  .refine((a) => !/[\u0000-\u001f\u007f<>",;\\]/.test(a), 'an e-mail address only: no names, lists or line breaks');

/** POST /api/share-links/:id/email (technician or admin): the link's token proves it was just made. */
export const EmailShareLinkRequestSchema = z.strictObject({
  /** The token the creating answer gave (the server keeps only its hash, so it cannot write the link without it). */
  token: z.string().max(100),
  to: MailAddressSchema,
  /** A short note to the client, put in the body only (never a header); line breaks kept. */
  message: z
    .string()
    .max(SHARE_MAIL_MESSAGE_MAX_CHARS)
    // eslint-disable-next-line no-control-regex -- control characters other than line breaks and tabs are refused
    .refine((m) => !/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.test(m), 'plain text only')
    .optional(),
});
export type EmailShareLinkRequest = z.input<typeof EmailShareLinkRequestSchema>;

/** The answer: the mail is queued (it goes out within seconds, retried while SMTP is away). */
export const EmailShareLinkResponseSchema = z.object({ queued: z.literal(true), mailId: z.number().int() });

/** One e-mail of a link, as GET /api/share-links/:id/mails lists it (never the body). */
export const ShareLinkMailSchema = z.object({
  id: z.number().int(),
  toAddress: z.string(),
  status: z.enum(['pending', 'sent', 'failed']),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
});
export type ShareLinkMail = z.infer<typeof ShareLinkMailSchema>;
export const ShareLinkMailsResponseSchema = z.object({ mails: z.array(ShareLinkMailSchema) });

/** A link as its makers see it (never the token, which only the creating answer carries). */
export const ShareLinkSchema = z.object({
  id: z.number().int(),
  kind: ShareTargetKindSchema,
  targetId: z.number().int(),
  includePrices: z.boolean(),
  recipient: z.string().nullable(),
  createdByName: z.string(),
  createdAt: z.string(),
  expiresAt: z.string(),
  revokedAt: z.string().nullable(),
  revokedByName: z.string().nullable(),
  /** `active`, or why it no longer opens. */
  state: z.enum(['active', 'expired', 'revoked']),
  openings: z.number().int(),
});
export type ShareLink = z.infer<typeof ShareLinkSchema>;

/** The answer to POST /api/share-links: the token, once; the server keeps only its hash. */
export const CreateShareLinkResponseSchema = z.object({ link: ShareLinkSchema, token: z.string(), path: z.string() });
export const ShareLinksResponseSchema = z.object({ links: z.array(ShareLinkSchema) });

/** What an opening read: the report page or its PDF. */
export const ShareOpeningWhatSchema = z.enum(['page', 'pdf']);
export type ShareOpeningWhat = z.infer<typeof ShareOpeningWhatSchema>;

/** One logged opening of a link. */
export const ShareOpeningSchema = z.object({ openedAt: z.string(), addressHash: z.string(), userAgent: z.string(), what: ShareOpeningWhatSchema });
export const ShareOpeningsResponseSchema = z.object({ openings: z.array(ShareOpeningSchema) });

/** The lab as a shared page names it, with the units it reports in. */
export const SharedLabSchema = z.object({
  name: z.string(),
  timeZone: z.string(),
  temperatureUnit: z.enum(['C', 'F']),
  energyUnit: z.enum(['Wh', 'kWh']),
});

/** A pack as a shared page shows it: no price unless chosen, no internal notes or people. */
export const SharedBatterySchema = BatterySchema.omit({ notes: true, sender: true, owner: true, createdAt: true, updatedAt: true });
export type SharedBattery = z.infer<typeof SharedBatterySchema>;

/** A run as a shared page shows it: no bench, no creator. */
export const SharedRunSchema = RunSchema.omit({ benchId: true, createdBy: true, readingsCount: true, alarms: true, summary: true });

/** GET /api/shared/:token for a run. */
export const SharedRunReportSchema = z.object({
  kind: z.literal('run'),
  lab: SharedLabSchema,
  expiresAt: z.string(),
  includePrices: z.boolean(),
  run: SharedRunSchema,
  summary: RunSummarySchema.nullable(),
  battery: SharedBatterySchema.nullable(),
  events: z.array(StoredRunEventSchema),
  signoff: SignoffBlockSchema,
});
export type SharedRunReport = z.infer<typeof SharedRunReportSchema>;

/** One run in a shared pack's capacity history and protection record (named, not linked). */
export const SharedPackRunSchema = z.object({
  name: z.string(),
  kind: z.string(),
  startedAt: z.string().nullable(),
  capacityAh: z.number().nullable(),
  capacityWh: z.number().nullable(),
  percentRatedAh: z.number().nullable(),
  verdict: VerdictSchema.nullable(),
  protectionTrips: z.array(ProtectionTripSchema),
  protections: z.array(ProtectionResultSchema),
});

/** One checklist line of a shared pack's inspection; photos by id, fetched through the token. */
export const SharedInspectionEntrySchema = z.object({
  item: InspectionItemSchema.pick({ id: true, title: true }),
  rating: InspectionRatingSchema.nullable(),
  note: z.string().nullable(),
  photoIds: z.array(z.number().int()),
});

/** GET /api/shared/:token for a pack. */
export const SharedPackReportSchema = z.object({
  kind: z.literal('battery'),
  lab: SharedLabSchema,
  expiresAt: z.string(),
  includePrices: z.boolean(),
  battery: SharedBatterySchema,
  runs: z.array(SharedPackRunSchema),
  inspection: z.array(SharedInspectionEntrySchema),
  otherPhotoIds: z.array(z.number().int()),
});
export type SharedPackReport = z.infer<typeof SharedPackReportSchema>;

/** Either shared report. */
export const SharedReportSchema = z.discriminatedUnion('kind', [SharedRunReportSchema, SharedPackReportSchema]);
export type SharedReport = z.infer<typeof SharedReportSchema>;
