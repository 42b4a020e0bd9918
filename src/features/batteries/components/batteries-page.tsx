import { useState } from 'react';
import type { Battery } from '../../../../shared/schemas/battery';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { Loading, QueryError } from '../../../components/ui/status';
import { useBatteries } from '../api/batteries';
import { BatteriesTable } from './batteries-table';
import { BatteryForm } from './battery-form';

/** Battery packs: everyone reads; technicians and lab managers register new ones. */
export function BatteriesPage({ canWrite }: { canWrite: boolean }) {
  const batteries = useBatteries();
  const [adding, setAdding] = useState(false);
  const [editing, setEditing] = useState<Battery | null>(null);
  return (
    <>
      <PageHeader
        title="Battery packs"
        subtitle="Every pack received by the lab, with its ratings."
        actions={canWrite && !adding ? <Button onClick={() => setAdding(true)}>Register a pack</Button> : undefined}
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
        <BatteriesTable batteries={batteries.data} onEdit={canWrite ? setEditing : undefined} />
      )}
    </>
  );
}
