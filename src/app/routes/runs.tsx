import { useState } from 'react';
import { useMe } from '../../features/auth/api/get-me';
import { RunsTable } from '../../features/runs/components/runs-table';
import { ImportRunForm } from '../../features/runs/components/import-run-form';
import { Card, PageHeader } from '../../components/ui/card';
import { Button } from '../../components/ui/button';
import { hasRole } from '../../lib/roles';

/** The run archive; technicians may import logs from other loggers. */
export function Component() {
  const me = useMe();
  const [importing, setImporting] = useState(false);
  const canImport = hasRole(me.data?.role, 'technician');
  return (
    <>
      <PageHeader
        title="Runs"
        subtitle="Every run recorded or imported, searchable."
        actions={canImport && !importing ? <Button onClick={() => setImporting(true)}>Import a CSV log</Button> : undefined}
      />
      {importing && (
        <Card className="mb-6 p-6">
          <ImportRunForm onDone={() => setImporting(false)} />
        </Card>
      )}
      <RunsTable />
    </>
  );
}
