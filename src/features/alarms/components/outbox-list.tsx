import { useQuery } from '@tanstack/react-query';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { outboxQueryOptions } from '../../../lib/queries/alarms';

/** What the local fake SMTP server received (admin; demo, development and tests). */
export function OutboxList() {
  const outbox = useQuery({ ...outboxQueryOptions(), refetchInterval: 5000 });
  return (
    <Card className="flex flex-col gap-3 p-6">
      <h2 className="text-lg font-semibold">Outbox (mail the local test server received)</h2>
      {outbox.isPending ? <Loading /> : outbox.isError ? <QueryError error={outbox.error} what="the outbox" /> : outbox.data.length === 0 ? <p>No mail yet.</p> : (
        <ul className="flex flex-col gap-3">
          {outbox.data.map((m) => (
            <li key={m.id} className="rounded-lg border border-line p-3">
              <p className="font-semibold">{m.subject}</p>
              <p className="text-sm text-ink-muted">To {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString()}</p>
              <pre className="mt-2 whitespace-pre-wrap text-sm">{m.text}</pre>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
