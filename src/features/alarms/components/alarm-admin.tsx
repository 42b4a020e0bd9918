import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { ALARM_KINDS, type AlarmKind, type AlarmSettings } from '../../../../shared/schemas/alarm';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import {
  alarmSettingsQueryOptions, endShelving, onCallCandidatesQueryOptions, onCallQueryOptions, saveAlarmSettings, saveOnCall,
  shelveAlarmKind, shelvesQueryOptions,
} from '../../../lib/queries/alarms';
import { benchesQueryOptions } from '../../../lib/queries/benches';
import { queryKeys } from '../../../lib/queries/query-keys';
import { KIND_LABEL } from './subscriptions-form';

const inputClass = 'min-h-11 max-w-full rounded-lg border border-line bg-surface px-2 py-1.5';
const errorText = (err: unknown) => (err instanceof Error ? err.message : 'Not saved');

function SettingsCard({ initial }: { initial: AlarmSettings }) {
  const [v, setV] = useState(initial);
  const [status, setStatus] = useState<string | null>(null);
  const field = (key: keyof AlarmSettings, label: string) => (
    <label className="flex flex-col gap-1">
      {label}
      <input className={inputClass} type="number" min={1} value={v[key]} onChange={(e) => setV({ ...v, [key]: Number(e.target.value) })} />
    </label>
  );
  return (
    <div className="flex flex-col gap-3">
      <h3 className="font-semibold">Lab alarm settings</h3>
      <div className="grid gap-3 md:grid-cols-3">
        {field('escalateAfterMinutes', 'Send again, then call the next on-call person, after (min)')}
        {field('sourceLostSeconds', 'Meter silent alarm after (s)')}
        {field('nearEndMinutes', 'Near-the-end alarm when the end is estimated within (min)')}
      </div>
      <div className="flex gap-2">
        <Button onClick={() => saveAlarmSettings(v).then(() => setStatus('Saved.'), (e: unknown) => setStatus(errorText(e)))}>Save alarm settings</Button>
        {status && <p role="status" className="self-center">{status}</p>}
      </div>
    </div>
  );
}

function OnCallEditor({ benchId }: { benchId: number }) {
  const list = useQuery(onCallQueryOptions(benchId));
  const users = useQuery(onCallCandidatesQueryOptions());
  const queryClient = useQueryClient();
  const [ids, setIds] = useState<number[] | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  if (list.isPending || users.isPending) return <Loading />;
  if (list.isError) return <QueryError error={list.error} what="the on-call list" />;
  if (users.isError) return <QueryError error={users.error} what="the users" />;
  const current = ids ?? list.data.map((o) => o.userId);
  const name = (id: number) => users.data.find((u) => u.id === id)?.name ?? `User ${id}`;
  return (
    <div className="flex flex-col gap-2">
      <ol className="list-decimal pl-6">
        {current.map((id, i) => (
          <li key={id} className="flex items-center gap-2">
            <span>{name(id)}</span>
            <Button variant="ghost" disabled={i === 0} onClick={() => setIds(current.map((x, j) => (j === i - 1 ? id : j === i ? current[i - 1]! : x)))}>Up</Button>
            <Button variant="ghost" onClick={() => setIds(current.filter((x) => x !== id))}>Remove</Button>
          </li>
        ))}
      </ol>
      <div className="flex flex-wrap gap-2">
        <select aria-label="Add to on-call" className={inputClass} value="" onChange={(e) => e.target.value && setIds([...current, Number(e.target.value)])}>
          <option value="">Add a person…</option>
          {users.data.filter((u) => !current.includes(u.id)).map((u) => <option key={u.id} value={u.id}>{u.name}</option>)}
        </select>
        <Button onClick={() => saveOnCall(benchId, current).then((saved) => {
          queryClient.setQueryData(onCallQueryOptions(benchId).queryKey, saved);
          setIds(null);
          setStatus('Saved.');
        }, (e: unknown) => setStatus(errorText(e)))}>Save on-call list</Button>
        {status && <p role="status" className="self-center">{status}</p>}
      </div>
    </div>
  );
}

function Shelving({ benches }: { benches: { id: number; name: string }[] }) {
  const shelves = useQuery(shelvesQueryOptions());
  const queryClient = useQueryClient();
  const [form, setForm] = useState({ benchId: benches[0]?.id ?? 0, kind: 'near-end' as AlarmKind, minutes: 60, reason: '' });
  const [status, setStatus] = useState<string | null>(null);
  const refresh = () => void queryClient.invalidateQueries({ queryKey: queryKeys.alarms.all });
  const benchName = (id: number) => benches.find((b) => b.id === id)?.name ?? `Bench ${id}`;
  return (
    <div className="flex flex-col gap-3">
      <h3 className="font-semibold">Shelve an alarm</h3>
      <p className="text-sm">A shelved kind is still recorded on the run but tells nobody until the time is up. Every shelving is logged.</p>
      <div className="flex flex-wrap gap-2">
        <select aria-label="Shelve on bench" className={inputClass} value={form.benchId} onChange={(e) => setForm({ ...form, benchId: Number(e.target.value) })}>
          {benches.map((b) => <option key={b.id} value={b.id}>{b.name}</option>)}
        </select>
        <select aria-label="Shelve alarm" className={inputClass} value={form.kind} onChange={(e) => setForm({ ...form, kind: e.target.value as AlarmKind })}>
          {ALARM_KINDS.map((k) => <option key={k} value={k}>{KIND_LABEL[k]}</option>)}
        </select>
        <input aria-label="For minutes" className={inputClass} type="number" min={1} value={form.minutes} onChange={(e) => setForm({ ...form, minutes: Number(e.target.value) })} />
        <input aria-label="Reason" className={inputClass} placeholder="Reason" value={form.reason} onChange={(e) => setForm({ ...form, reason: e.target.value })} />
        <Button disabled={!form.benchId} onClick={() => shelveAlarmKind(form).then(() => (setStatus('Shelved.'), refresh()), (e: unknown) => setStatus(errorText(e)))}>Shelve</Button>
        {status && <p role="status" className="self-center">{status}</p>}
      </div>
      {shelves.isPending ? <Loading /> : shelves.isError ? <QueryError error={shelves.error} what="the shelving log" /> : (
        <ul className="flex flex-col gap-1 text-sm">
          {shelves.data.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center gap-2">
              <span>{KIND_LABEL[s.kind]} on {benchName(s.benchId)} by {s.shelvedBy?.name ?? 'someone removed'}, {new Date(s.shelvedAt).toLocaleString()} until {new Date(s.until).toLocaleString()}: {s.reason}{s.endedAt ? ` · ended ${new Date(s.endedAt).toLocaleString()} by ${s.endedBy?.name ?? '?'}` : ''}</span>
              {!s.endedAt && Date.parse(s.until) > Date.now() && <Button variant="ghost" onClick={() => endShelving(s.id).then(refresh, (e: unknown) => setStatus(errorText(e)))}>End now</Button>}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The admin's part of the alarms page: lab settings, each bench's on-call list, shelving and its log. */
export function AlarmAdmin() {
  const settings = useQuery(alarmSettingsQueryOptions());
  const benches = useQuery(benchesQueryOptions());
  const [benchId, setBenchId] = useState<number | null>(null);
  if (settings.isPending || benches.isPending) return <Loading />;
  if (settings.isError) return <QueryError error={settings.error} what="the alarm settings" />;
  if (benches.isError) return <QueryError error={benches.error} what="the benches" />;
  const chosen = benchId ?? benches.data[0]?.id ?? null;
  return (
    <Card className="flex flex-col gap-6 p-6">
      <h2 className="text-lg font-semibold">Alarm administration</h2>
      <SettingsCard initial={settings.data} />
      <div className="flex flex-col gap-2">
        <h3 className="font-semibold">On-call list</h3>
        <p className="text-sm">The first person hears of every critical alarm on the bench at once; each later one is called in turn while it stays unacknowledged.</p>
        <select aria-label="On-call for bench" className={inputClass} value={chosen ?? ''} onChange={(e) => setBenchId(Number(e.target.value))}>
          {benches.data.map((b) => <option key={b.id} value={b.id}>{b.name}</option>)}
        </select>
        {chosen !== null && <OnCallEditor key={chosen} benchId={chosen} />}
      </div>
      <Shelving benches={benches.data} />
    </Card>
  );
}
