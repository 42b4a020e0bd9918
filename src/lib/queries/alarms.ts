import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  AlarmChannelNameSchema, AlarmSchema, AlarmSubscriptionSchema, OutboxMessageSchema, type Alarm, type AlarmSubscription,
} from '../../../shared/schemas/alarm';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

const AlarmsSchema = z.object({ alarms: z.array(AlarmSchema) });
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
