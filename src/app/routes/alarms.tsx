import type { QueryClient } from '@tanstack/react-query';
import { Card, PageHeader } from '../../components/ui/card';
import { AlarmAdmin } from '../../features/alarms/components/alarm-admin';
import { OutboxList } from '../../features/alarms/components/outbox-list';
import { PushBrowserToggle } from '../../features/alarms/components/push-browser-toggle';
import { SubscriptionsForm } from '../../features/alarms/components/subscriptions-form';
import { useMe } from '../../features/auth/api/get-me';
import { channelsQueryOptions, subscriptionsQueryOptions } from '../../lib/queries/alarms';

/** My alarm subscriptions; for an admin also the outbox of the local mail server. */
export function Component() {
  const me = useMe();
  return (
    <div className="flex flex-col gap-6">
      <PageHeader title="Alarms" subtitle="Which alarms reach you, on which bench, and how." />
      <Card className="flex flex-col gap-3">
        <h2 className="text-lg font-semibold">This browser</h2>
        <p className="text-sm text-ink-muted">Push notifications reach this browser (a phone too) with no Kneepoint tab open, and let you acknowledge from the notification.</p>
        <PushBrowserToggle />
      </Card>
      <SubscriptionsForm />
      {me.data?.role === 'admin' && <AlarmAdmin />}
      {me.data?.role === 'admin' && <OutboxList />}
    </div>
  );
}

/** The subscriptions and channels. */
export function prefetch(queryClient: QueryClient): void {
  void queryClient.prefetchQuery(subscriptionsQueryOptions());
  void queryClient.prefetchQuery(channelsQueryOptions());
}
