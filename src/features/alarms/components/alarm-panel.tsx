import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { Alarm } from '../../../../shared/schemas/alarm';
import { formatAmps, formatCharge, formatDuration, formatEnergy, formatTemperature, formatVolts } from '../../../../shared/units/format';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { labSettingsQueryOptions } from '../../../lib/lab-settings';
import { acknowledgeAlarm, alarmQueryOptions } from '../../../lib/queries/alarms';
import { queryKeys } from '../../../lib/queries/query-keys';
import { KIND_LABEL } from './subscriptions-form';

const STATE_LABEL: Record<Alarm['state'], string> = {
  'unacknowledged': 'Active, not acknowledged',
  'acknowledged': 'Acknowledged, still active',
  'cleared-unacknowledged': 'Back to normal, not acknowledged',
  'cleared': 'Acknowledged and back to normal',
};

/** One alarm with its values and an Acknowledge button (the page an alarm e-mail links to). */
export function AlarmPanel({ alarmId }: { alarmId: number }) {
  const alarm = useQuery(alarmQueryOptions(alarmId));
  const settings = useQuery(labSettingsQueryOptions());
  const queryClient = useQueryClient();
  const [error, setError] = useState<string | null>(null);
  if (alarm.isPending) return <Loading />;
  if (alarm.isError) return <QueryError error={alarm.error} what="the alarm" />;
  const a = alarm.data;
  const tUnit = settings.data?.temperatureUnit ?? 'C';
  const acknowledge = () => {
    setError(null);
    acknowledgeAlarm(a.id).then(
      (updated) => {
        queryClient.setQueryData(queryKeys.alarms.detail(a.id), updated);
        void queryClient.invalidateQueries({ queryKey: queryKeys.alarms.all });
      },
      (err: unknown) => setError(err instanceof Error ? err.message : 'Not acknowledged'),
    );
  };
  const rows: [string, string][] = [
    ['Voltage', formatVolts(a.values.volts, 3)], ['Current', formatAmps(a.values.amps)],
    ['Energy out', formatEnergy(a.values.dischargeWh, settings.data?.energyUnit ?? 'Wh')], ['Charge out', formatCharge(a.values.dischargeAh)],
    ['Temperature', formatTemperature(a.values.tempCelsius, tUnit)], ['Run time', formatDuration(a.values.runSeconds)],
  ];
  return (
    <Card className="flex flex-col gap-4 p-6">
      <h2 className="text-xl font-bold">{KIND_LABEL[a.kind]} · {a.priority}</h2>
      <p>{a.message}</p>
      <p className="font-semibold">{STATE_LABEL[a.state]}{a.acknowledgedBy && a.acknowledgedAt ? ` · acknowledged by ${a.acknowledgedBy.name} at ${new Date(a.acknowledgedAt).toLocaleString()}` : ''}</p>
      {a.shelved && <p>This kind was shelved on the bench when it was raised: recorded, nobody was told.</p>}
      <dl className="grid grid-cols-2 gap-x-6 gap-y-1 font-mono">
        {rows.map(([k, v]) => <div key={k} className="contents"><dt>{k}</dt><dd>{v}</dd></div>)}
      </dl>
      <div className="flex flex-wrap items-center gap-3">
        {a.acknowledgedAt === null && <Button variant="danger" onClick={acknowledge}>Acknowledge</Button>}
        <Link className="underline" to={`/runs/${a.runId}`}>Open the run</Link>
        {error && <p role="alert">Not acknowledged: {error}</p>}
      </div>
    </Card>
  );
}
