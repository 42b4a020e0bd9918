import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { ALARM_KINDS, type AlarmChannelName, type AlarmKind, type AlarmSubscription } from '../../../../shared/schemas/alarm';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { benchesQueryOptions } from '../../../lib/queries/benches';
import { channelsQueryOptions, saveSubscriptions, subscriptionsQueryOptions } from '../../../lib/queries/alarms';
import { queryKeys } from '../../../lib/queries/query-keys';

/** Words for each alarm kind on screen. */
export const KIND_LABEL: Record<AlarmKind, string> = {
  'cutoff': 'Cutoff (end voltage)',
  'protection-trip': 'Protection trip',
  'over-temperature': 'Over-temperature',
  'under-temperature': 'Under-temperature',
  'near-end': 'Near the end',
  'source-lost': 'Meter silent',
  'run-finished': 'Run finished',
  'programme-failed': 'Programme failed safe',
};
const CHANNEL_LABEL: Record<AlarmChannelName, string> = { 'in-app': 'In the app', 'email': 'E-mail', 'push': 'Push to this browser' };
const selectClass = 'min-h-11 max-w-full rounded-lg border border-line bg-surface px-2 py-1.5';

function Rows({ initial, channels }: { initial: AlarmSubscription[]; channels: AlarmChannelName[] }) {
  const benches = useQuery(benchesQueryOptions());
  const queryClient = useQueryClient();
  const [rows, setRows] = useState<AlarmSubscription[]>(initial);
  const [status, setStatus] = useState<string | null>(null);
  const set = (i: number, patch: Partial<AlarmSubscription>) => setRows((r) => r.map((row, j) => (j === i ? { ...row, ...patch } : row)));
  const save = () => {
    setStatus('Saving…');
    saveSubscriptions(rows).then(
      (saved) => {
        queryClient.setQueryData(queryKeys.alarms.subscriptions(), saved);
        setRows(saved);
        setStatus('Saved.');
      },
      (err: unknown) => setStatus(err instanceof Error ? err.message : 'Not saved'),
    );
  };
  return (
    <div className="flex flex-col gap-3">
      {rows.length === 0 && <p className="text-ink-muted">No alarm reaches you outside an open page yet.</p>}
      {rows.map((row, i) => (
        <div key={i} className="flex flex-wrap items-center gap-2" aria-label={`Subscription ${i + 1}`} role="group">
          <select aria-label="Bench" className={selectClass} value={row.benchId ?? ''} onChange={(e) => set(i, { benchId: e.target.value ? Number(e.target.value) : null })}>
            <option value="">Every bench</option>
            {(benches.data ?? []).map((b) => <option key={b.id} value={b.id}>{b.name}</option>)}
          </select>
          <select aria-label="Alarm" className={selectClass} value={row.kind} onChange={(e) => set(i, { kind: e.target.value as AlarmKind })}>
            {ALARM_KINDS.map((k) => <option key={k} value={k}>{KIND_LABEL[k]}</option>)}
          </select>
          <select aria-label="By" className={selectClass} value={row.channel} onChange={(e) => set(i, { channel: e.target.value as AlarmChannelName })}>
            {(['in-app', 'email', 'push'] as const).map((c) => <option key={c} value={c} disabled={!channels.includes(c)}>{CHANNEL_LABEL[c]}{channels.includes(c) ? '' : ' (not set up here)'}</option>)}
          </select>
          <Button variant="secondary" onClick={() => setRows((r) => r.filter((_, j) => j !== i))}>Remove</Button>
        </div>
      ))}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => setRows((r) => [...r, { benchId: null, kind: 'cutoff', channel: channels.includes('email') ? 'email' : 'in-app' }])}>Add</Button>
        <Button onClick={save}>Save my alarms</Button>
        {status && <p role="status" className="self-center">{status}</p>}
      </div>
    </div>
  );
}

/**
 * The signed-in person's own alarm subscriptions: which kinds, on which bench (or every
 * bench), reach them by which channel. Shown with the caution that a message is no
 * substitute for someone at the bench.
 */
export function SubscriptionsForm() {
  const subs = useQuery(subscriptionsQueryOptions());
  const channels = useQuery(channelsQueryOptions());
  return (
    <Card className="flex flex-col gap-4 p-6">
      <h2 className="text-lg font-semibold">Alarms that reach me</h2>
      <p role="note" className="rounded-lg border border-state-cutoff p-3 text-sm">
        Caution: an unattended test needs someone told at once and able to reach the bench. A message can be late or
        missed (mail servers, phones on silent), so keep the on-call list short and current, and follow your local codes,
        the makers&apos; instructions and licensed practice on leaving charges and loads unattended.
      </p>
      {subs.isPending || channels.isPending ? <Loading /> : subs.isError ? <QueryError error={subs.error} what="your alarm subscriptions" /> : channels.isError ? <QueryError error={channels.error} what="the alarm channels" /> : <Rows initial={subs.data} channels={channels.data} />}
    </Card>
  );
}
