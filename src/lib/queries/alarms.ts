import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  AlarmChannelNameSchema, AlarmSchema, AlarmSettingsSchema, AlarmShelfSchema, AlarmSubscriptionSchema, OutboxMessageSchema,
  type Alarm, type AlarmKind, type AlarmSettings, type AlarmSubscription,
} from '../../../shared/schemas/alarm';
import { PublicUserSchema } from '../../../shared/schemas/user';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

const AlarmsSchema = z.object({ alarms: z.array(AlarmSchema) });
const OnCallSchema = z.object({ onCall: z.array(z.object({ userId: z.number(), name: z.string() })) });
const SubscriptionsSchema = z.object({ subscriptions: z.array(AlarmSubscriptionSchema) });

/** GET /api/alarms?runId=: one run's alarms, newest first. */
export function fetchRunAlarms(runId: number): Promise<Alarm[]> {
  return api(`/api/alarms?runId=${runId}`, { schema: AlarmsSchema }).then((b) => b.alarms);
}

/** One run's alarms as a query. */
export const runAlarmsQueryOptions = (runId: number) => queryOptions({ queryKey: queryKeys.alarms.ofRun(runId), queryFn: () => fetchRunAlarms(runId) });

/** GET /api/alarms/:id: one alarm (the page an alarm e-mail links to). */
export const alarmQueryOptions = (alarmId: number) =>
  queryOptions({ queryKey: queryKeys.alarms.detail(alarmId), queryFn: () => api(`/api/alarms/${alarmId}`, { schema: z.object({ alarm: AlarmSchema }) }).then((b) => b.alarm) });

/** GET /api/alarms/inbox: the alarms delivered to me in the app. */
export const inboxQueryOptions = () =>
  queryOptions({ queryKey: queryKeys.alarms.inbox(), queryFn: () => api('/api/alarms/inbox', { schema: AlarmsSchema }).then((b) => b.alarms) });

/** GET /api/alarms/subscriptions: mine. */
export const subscriptionsQueryOptions = () =>
  queryOptions({ queryKey: queryKeys.alarms.subscriptions(), queryFn: () => api('/api/alarms/subscriptions', { schema: SubscriptionsSchema }).then((b) => b.subscriptions) });

/** GET /api/alarms/channels: the channels that deliver on this server. */
export const channelsQueryOptions = () =>
  queryOptions({ queryKey: queryKeys.alarms.channels(), queryFn: () => api('/api/alarms/channels', { schema: z.object({ channels: z.array(AlarmChannelNameSchema) }) }).then((b) => b.channels) });

/** GET /api/alarms/outbox (admin): what the local fake SMTP server received. */
export const outboxQueryOptions = () =>
  queryOptions({ queryKey: queryKeys.alarms.outbox(), queryFn: () => api('/api/alarms/outbox', { schema: z.object({ messages: z.array(OutboxMessageSchema) }) }).then((b) => b.messages) });

/** POST /api/alarms/:id/acknowledge: a person takes the alarm (stops escalation everywhere). */
export function acknowledgeAlarm(alarmId: number): Promise<Alarm> {
  return api(`/api/alarms/${alarmId}/acknowledge`, { method: 'POST', body: {}, schema: z.object({ alarm: AlarmSchema }) }).then((b) => b.alarm);
}

/** PUT /api/alarms/subscriptions: replaces all of mine. */
export function saveSubscriptions(subscriptions: AlarmSubscription[]): Promise<AlarmSubscription[]> {
  return api('/api/alarms/subscriptions', { method: 'PUT', body: { subscriptions }, schema: SubscriptionsSchema }).then((b) => b.subscriptions);
}

/** GET /api/users (admin): people for the on-call lists (the same key and data as the users page). */
export const onCallCandidatesQueryOptions = () =>
  queryOptions({ queryKey: queryKeys.users.all, queryFn: () => api('/api/users', { schema: z.object({ users: z.array(PublicUserSchema) }) }).then((b) => b.users) });

/** GET /api/alarms/on-call/:benchId: the bench's on-call list in calling order. */
export const onCallQueryOptions = (benchId: number) =>
  queryOptions({ queryKey: [...queryKeys.alarms.all, 'on-call', benchId] as const, queryFn: () => api(`/api/alarms/on-call/${benchId}`, { schema: OnCallSchema }).then((b) => b.onCall) });

/** PUT /api/alarms/on-call/:benchId (admin). */
export function saveOnCall(benchId: number, userIds: number[]) {
  return api(`/api/alarms/on-call/${benchId}`, { method: 'PUT', body: { userIds }, schema: OnCallSchema }).then((b) => b.onCall);
}

/** GET /api/alarms/settings. */
export const alarmSettingsQueryOptions = () =>
  queryOptions({ queryKey: [...queryKeys.alarms.all, 'settings'] as const, queryFn: () => api('/api/alarms/settings', { schema: z.object({ settings: AlarmSettingsSchema }) }).then((b) => b.settings) });

/** PUT /api/alarms/settings (admin). */
export function saveAlarmSettings(settings: AlarmSettings) {
  return api('/api/alarms/settings', { method: 'PUT', body: settings, schema: z.object({ settings: AlarmSettingsSchema }) }).then((b) => b.settings);
}

/** GET /api/alarms/shelves: the shelving log. */
export const shelvesQueryOptions = () =>
  queryOptions({ queryKey: [...queryKeys.alarms.all, 'shelves'] as const, queryFn: () => api('/api/alarms/shelves', { schema: z.object({ shelves: z.array(AlarmShelfSchema) }) }).then((b) => b.shelves) });

/** POST /api/alarms/shelves (admin): shelve a kind on a bench for a stated time. */
export function shelveAlarmKind(body: { benchId: number; kind: AlarmKind; minutes: number; reason: string }) {
  return api('/api/alarms/shelves', { method: 'POST', body, schema: z.object({ shelf: AlarmShelfSchema }) }).then((b) => b.shelf);
}

/** POST /api/alarms/shelves/:id/end (admin): end a shelving early. */
export function endShelving(id: number) {
  return api(`/api/alarms/shelves/${id}/end`, { method: 'POST', body: {}, schema: z.object({ shelf: AlarmShelfSchema }) }).then((b) => b.shelf);
}
