import { useParams } from 'react-router-dom';
import { PageHeader } from '../../components/ui/card';
import { NotAvailable } from '../../components/ui/status';
import { AlarmPanel } from '../../features/alarms/components/alarm-panel';

/** One alarm: the page an alarm e-mail links to (sign-in first, then Acknowledge works). */
export function Component() {
  const { alarmId } = useParams();
  const id = alarmId && /^[1-9]\d*$/.test(alarmId) ? Number(alarmId) : null;
  return (
    <>
      <PageHeader title="Alarm" />
      {id === null ? <NotAvailable what="This alarm" detail="The link does not name an alarm." /> : <AlarmPanel alarmId={id} />}
    </>
  );
}
