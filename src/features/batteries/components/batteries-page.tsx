import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { Battery } from '../../../../shared/schemas/battery';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { Loading, QueryError } from '../../../components/ui/status';
import { useBatteries, useProtectionRecord } from '../api/batteries';
import { ProtectionRecordTable } from '../../../components/ui/protection-record-table';
import { BatteriesTable } from './batteries-table';
import { BatteryForm } from './battery-form';

/** One pack's protection record under the packs table. */
function ProtectionRecordCard({ battery, onClose }: { battery: Battery; onClose: () => void }) {
  const record = useProtectionRecord(battery.id);
  return (
    <Card className="mt-6 flex flex-col gap-3 p-6">
      <div className="flex items-center justify-between gap-2">
        <h2 className="text-lg font-bold">Protection record: {battery.label}</h2>
        <Button variant="secondary" onClick={onClose}>
          Close
        </Button>
      </div>
      {record.isPending ? <Loading /> : record.isError ? <QueryError error={record.error} what="Protection record" /> : <ProtectionRecordTable rows={record.data.rows} />}
    </Card>
  );
}

/** Battery packs: everyone reads; technicians and lab managers register new ones. */
export function BatteriesPage({ canWrite }: { canWrite: boolean }) {
  const batteries = useBatteries();
  const [adding, setAdding] = useState(false);
  const [editing, setEditing] = useState<Battery | null>(null);
  const [record, setRecord] = useState<Battery | null>(null);
  return (
    <>
      <PageHeader
        title="Battery packs"
        subtitle="Every pack received by the lab, with its ratings."
        actions={
          <div className="flex flex-wrap gap-2">
            <Link to="/runs/compare?packs=" className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 font-semibold text-accent hover:underline">
              Compare packs
            </Link>
            {canWrite && !adding && <Button onClick={() => setAdding(true)}>Register a pack</Button>}
          </div>
        }
      />
      {adding && (
        <Card className="mb-6 flex flex-col gap-4 p-6">
          <h2 className="text-lg font-bold">Register a pack</h2>
          <SafetyCautions compact />
          <BatteryForm onDone={() => setAdding(false)} />
        </Card>
      )}
      {editing && (
        <Card className="mb-6 flex flex-col gap-4 p-6">
          <h2 className="text-lg font-bold">Edit {editing.label}</h2>
          <BatteryForm key={editing.id} battery={editing} onDone={() => setEditing(null)} />
        </Card>
      )}
      {batteries.isPending ? (
        <Loading />
      ) : batteries.isError ? (
        <QueryError error={batteries.error} what="Battery packs" />
      ) : (
        <BatteriesTable batteries={batteries.data} onEdit={canWrite ? setEditing : undefined} onProtections={setRecord} />
      )}
      {record && <ProtectionRecordCard key={record.id} battery={record} onClose={() => setRecord(null)} />}
    </>
  );
}
