import { z } from 'zod';
import { labelText } from './text.js';

/** What an alarm is about. Each kind is raised from the run's own events (see server/alarms/alarm-rules.ts). */
export const AlarmKindSchema = z.enum([
  'cutoff', 'protection-trip', 'over-temperature', 'under-temperature', 'near-end', 'source-lost', 'run-finished',
  'programme-failed',
]);
export type AlarmKind = z.infer<typeof AlarmKindSchema>;
/** Every alarm kind, in the order screens list them. */
export const ALARM_KINDS = AlarmKindSchema.options;

/** How urgent: critical alarms latch (cutoff, protection trip) and escalate until acknowledged. */
export const AlarmPrioritySchema = z.enum(['info', 'warning', 'critical']);
export type AlarmPriority = z.infer<typeof AlarmPrioritySchema>;

/**
 * Where an alarm reaches a person. `in-app` is the user's alarm list and banner, `email` goes
 * through the delivery queue to SMTP, `push` is a Web Push channel plugged in beside them.
 */
export const AlarmChannelNameSchema = z.enum(['in-app', 'email', 'push']);
export type AlarmChannelName = z.infer<typeof AlarmChannelNameSchema>;

/**
 * The alarm's state, after the alarm-management lifecycle (ISA-18.2 / IEC 62682):
 * `unacknowledged` (active, nobody has acknowledged), `acknowledged` (active, someone has),
 * `cleared-unacknowledged` (returned to normal before anyone acknowledged it),
 * `cleared` (returned to normal and acknowledged: nothing left to do).
 */
export const AlarmStateSchema = z.enum(['unacknowledged', 'acknowledged', 'cleared-unacknowledged', 'cleared']);
export type AlarmState = z.infer<typeof AlarmStateSchema>;

/** The values at the moment of the alarm (what the message shows). Null when not measured. */
export const AlarmValuesSchema = z.object({
  volts: z.number().finite().nullable(),
  amps: z.number().finite().nullable(),
  dischargeWh: z.number().finite().nullable(),
  dischargeAh: z.number().finite().nullable(),
  /** The hottest temperature channel, °C. */
  tempCelsius: z.number().finite().nullable(),
  runSeconds: z.number().finite().nullable(),
});
export type AlarmValues = z.infer<typeof AlarmValuesSchema>;

/** A person as the alarm screens show them. */
const PersonSchema = z.object({ id: z.number().int(), name: z.string() });

/** One alarm as the API returns it. */
export const AlarmSchema = z.object({
  id: z.number().int().positive(),
  runId: z.number().int().positive(),
  benchId: z.number().int().positive().nullable(),
  kind: AlarmKindSchema,
  priority: AlarmPrioritySchema,
  state: AlarmStateSchema,
  message: z.string(),
  /** Run time of the event that raised it, s. */
  elapsedSeconds: z.number().finite(),
  values: AlarmValuesSchema,
  /** True when the kind was shelved on the bench when it was raised: recorded, nobody notified. */
  shelved: z.boolean(),
  raisedAt: z.string(),
  acknowledgedAt: z.string().nullable(),
  acknowledgedBy: PersonSchema.nullable(),
  clearedAt: z.string().nullable(),
  /** How many times it has been escalated (0 = only the first notice went out). */
  escalationStep: z.number().int().nonnegative(),
});
export type Alarm = z.infer<typeof AlarmSchema>;

/** One subscription: this alarm kind, on this bench (null = every bench), reaches me by this channel. */
export const AlarmSubscriptionSchema = z.object({
  benchId: z.number().int().positive().nullable(),
  kind: AlarmKindSchema,
  channel: AlarmChannelNameSchema,
});
export type AlarmSubscription = z.infer<typeof AlarmSubscriptionSchema>;

/** Most subscriptions one user may hold (benches × kinds × channels stays far below it in a lab). */
export const MAX_SUBSCRIPTIONS = 500;
/** PUT /api/alarms/subscriptions: the user's whole set, replacing what they had. */
export const AlarmSubscriptionsInputSchema = z.object({
  subscriptions: z.array(AlarmSubscriptionSchema.strict()).max(MAX_SUBSCRIPTIONS),
}).strict();

/** Longest on-call list a bench keeps. */
export const MAX_ON_CALL = 10;
/** PUT /api/alarms/on-call/:benchId: user ids in the order they are called. */
export const OnCallInputSchema = z.object({
  userIds: z.array(z.number().int().positive()).max(MAX_ON_CALL)
    .refine((ids) => new Set(ids).size === ids.length, 'a person appears once'),
}).strict();

/** Longest shelving: a week (common practice keeps shelving short and reviewed). */
export const MAX_SHELVE_MINUTES = 7 * 24 * 60;
/** POST /api/alarms/shelves: shelve one alarm kind on one bench for a stated time, with the reason. */
export const ShelveInputSchema = z.object({
  benchId: z.number().int().positive(),
  kind: AlarmKindSchema,
  minutes: z.number().int().min(1).max(MAX_SHELVE_MINUTES),
  reason: labelText(500),
}).strict();

/** One entry of the shelving log. */
export const AlarmShelfSchema = z.object({
  id: z.number().int(),
  benchId: z.number().int(),
  kind: AlarmKindSchema,
  reason: z.string(),
  shelvedBy: PersonSchema.nullable(),
  shelvedAt: z.string(),
  until: z.string(),
  endedAt: z.string().nullable(),
  endedBy: PersonSchema.nullable(),
});
export type AlarmShelf = z.infer<typeof AlarmShelfSchema>;

/** Lab-wide alarm settings (admin). */
export const AlarmSettingsSchema = z.object({
  /** An unacknowledged critical alarm is sent again after this many minutes, then to the next on-call person. */
  escalateAfterMinutes: z.number().int().min(1).max(24 * 60).default(10),
  /** No data for this long during a run raises `source-lost`. */
  sourceLostSeconds: z.number().int().min(5).max(3600).default(60),
  /** `near-end` is raised when the time to the end voltage is estimated under this many minutes. */
  nearEndMinutes: z.number().int().min(1).max(600).default(15),
}).strict();
export type AlarmSettings = z.infer<typeof AlarmSettingsSchema>;

/** One message the fake SMTP server received (the outbox admins read in demo and development). */
export const OutboxMessageSchema = z.object({
  id: z.number().int(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  receivedAt: z.string(),
});
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;
