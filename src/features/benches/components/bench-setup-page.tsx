import { useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { SafetyCautions } from '../../../components/ui/safety-cautions';
import { BenchStatusBadge } from '../../../components/ui/state-badge';
import { Loading, QueryError } from '../../../components/ui/status';
import { useBenchForEdit, useDeleteBench, useRestartBench } from '../api/manage-bench';
import { BenchForm } from './bench-form';

/** Add a bench (no id) or change one (lab managers). */
export function BenchSetupPage({ benchId }: { benchId: number | null }) {
  const bench = useBenchForEdit(benchId);
  const remove = useDeleteBench();
  const restart = useRestartBench();
  const navigate = useNavigate();
  if (benchId !== null && bench.isPending) return <Loading />;
  if (bench.isError) return <QueryError error={bench.error} what="This bench" />;
  const existing = benchId !== null ? bench.data : undefined;

  return (
    <>
      <PageHeader
        title={existing ? `Set up ${existing.name}` : 'New bench'}
        subtitle={existing ? <BenchStatusBadge state={existing.status.state} /> : 'A bench is a place where a pack is tested, with the meter that reads it.'}
        actions={
          existing && (
            <>
              <Button variant="secondary" onClick={() => restart.mutate(existing.id)} disabled={restart.isPending}>
                Reopen source
              </Button>
              <Button
                variant="danger"
                onClick={() => {
                  if (window.confirm(`Delete ${existing.name}? Its recorded runs stay in the archive.`)) {
                    remove.mutate(existing.id, { onSuccess: () => navigate('/') });
                  }
                }}
              >
                Delete
              </Button>
            </>
          )
        }
      />
      <div className="flex flex-col gap-4">
        <SafetyCautions compact />
        {existing?.status.message && <p className="text-sm text-ink-muted">Source: {existing.status.message}</p>}
        {/* Reopening is quiet on the server: say that it happened, or why it did not. */}
        {restart.isSuccess && <p role="status" className="text-sm font-medium text-state-recording">Source reopened.</p>}
        {restart.isError && (
          <p role="alert" className="text-sm font-medium text-state-cutoff">
            The source was not reopened: {restart.error instanceof Error ? restart.error.message : 'unknown error'}
          </p>
        )}
        <Card className="p-6">
          <BenchForm key={existing?.id ?? 'new'} bench={existing} onSaved={(id) => navigate(`/benches/${id}`)} />
        </Card>
      </div>
    </>
  );
}
