import { useState } from 'react';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me';
import { BatteriesPage } from '../../features/batteries/components/batteries-page';
import { BenchesOverview } from '../../features/benches/components/benches-overview';
import { BenchSetupPage } from '../../features/benches/components/bench-setup-page';
import { BenchLivePage } from '../../features/live/components/bench-live-page';
import { RoomView } from '../../features/live/components/room-view';
import { RunDetail } from '../../features/runs/components/run-detail';
import { RunsTable } from '../../features/runs/components/runs-table';
import { MAX_COMPARED_RUNS, RunCompare } from '../../features/runs/components/run-compare';
import { ImportRunForm } from '../../features/runs/components/import-run-form';
import { SettingsForm } from '../../features/settings/components/settings-form';
import { UsersPage } from '../../features/users/components/users-page';
import { Card, PageHeader } from '../../components/ui/card';
import { Button } from '../../components/ui/button';
import { hasRole } from '../../lib/roles';
import { RequireRole } from '../require-auth';

/** A numeric route parameter, or NaN (the page then shows "not found"). */
function useIdParam(name: string): number {
  const value = useParams()[name];
  return value && /^\d+$/.test(value) ? Number(value) : Number.NaN;
}

function NotFound() {
  return <PageHeader title="Not found" subtitle="There is nothing at this address." />;
}

/** Dashboard: every bench live. */
export function DashboardRoute() {
  const me = useMe();
  const isAdmin = hasRole(me.data?.role, 'admin');
  return (
    <>
      <PageHeader
        title="Benches"
        subtitle="Live status of every bench in the lab."
        actions={isAdmin ? <Link to="/benches/new" className="inline-flex min-h-11 items-center rounded-lg bg-accent px-4 text-sm font-semibold text-accent-ink">New bench</Link> : undefined}
      />
      <BenchesOverview canManage={hasRole(me.data?.role, 'admin')} />
    </>
  );
}

/** One bench, live. */
export function BenchRoute() {
  const me = useMe();
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  return <BenchLivePage key={benchId} benchId={benchId} canAct={hasRole(me.data?.role, 'technician')} canSetUp={hasRole(me.data?.role, 'admin')} />;
}

/** Add a bench (admin). */
export function NewBenchRoute() {
  return (
    <RequireRole min="admin">
      <BenchSetupPage benchId={null} />
    </RequireRole>
  );
}

/** Change a bench and its source (admin). */
export function EditBenchRoute() {
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  return (
    <RequireRole min="admin">
      <BenchSetupPage key={benchId} benchId={benchId} />
    </RequireRole>
  );
}

/** The across-the-room view. */
export function RoomRoute() {
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  return <RoomView key={benchId} benchId={benchId} />;
}

/** The run archive; technicians may import logs from other loggers. */
export function RunsRoute() {
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

/** Several runs side by side: /runs/compare?ids=3,5 */
export function CompareRoute() {
  const [params] = useSearchParams();
  const ids = (params.get('ids') ?? '')
    .split(',')
    .filter((x) => /^\d+$/.test(x))
    .map(Number)
    .slice(0, MAX_COMPARED_RUNS);
  if (ids.length === 0) return <NotFound />;
  return <RunCompare runIds={ids} />;
}

/** One recorded run. */
export function RunRoute() {
  const me = useMe();
  const runId = useIdParam('runId');
  if (Number.isNaN(runId)) return <NotFound />;
  return <RunDetail key={runId} runId={runId} canEdit={hasRole(me.data?.role, 'technician')} />;
}

/** Battery packs. */
export function BatteriesRoute() {
  const me = useMe();
  return <BatteriesPage canWrite={hasRole(me.data?.role, 'technician')} />;
}

/** User management (admin). */
export function UsersRoute() {
  const me = useMe();
  return (
    <RequireRole min="admin">
      <UsersPage currentUserId={me.data?.id ?? 0} />
    </RequireRole>
  );
}

/** Lab settings (admin). */
export function SettingsRoute() {
  return (
    <RequireRole min="admin">
      <PageHeader title="Lab settings" subtitle="Defaults for every run and every screen in the lab." />
      <SettingsForm />
    </RequireRole>
  );
}

export { NotFound as NotFoundRoute };
export { AccountRoute } from './account';
