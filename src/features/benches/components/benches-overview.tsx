import { Link } from 'react-router-dom';
import { Card } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { RunStateLegend } from '../../../components/ui/state-badge';
import { useLabSettings } from '../../../lib/lab-settings';
import { useBenches } from '../api/get-benches';
import { BenchCard } from './bench-card';

/** Every bench at a glance, live. */
export function BenchesOverview({ canManage }: { canManage: boolean }) {
  const benches = useBenches();
  const settings = useLabSettings();
  if (benches.isPending) return <Loading label="Loading benches…" />;
  if (benches.isError) return <QueryError error={benches.error} what="Benches" />;
  if (benches.data.length === 0) {
    return (
      <Card className="p-8 text-center">
        <p className="text-lg font-semibold">No benches yet</p>
        <p className="mt-2 text-ink-muted">
          {canManage ? (
            <>
              Add one under <Link className="text-accent underline" to="/benches/new">New bench</Link>.
            </>
          ) : (
            'A lab manager adds benches and their meters.'
          )}
        </p>
      </Card>
    );
  }
  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-4 md:grid-cols-2 2xl:grid-cols-3">
        {benches.data.map((bench) => (
          <BenchCard key={bench.id} bench={bench} temperatureUnit={settings.temperatureUnit} energyUnit={settings.energyUnit} />
        ))}
      </div>
      <RunStateLegend />
    </div>
  );
}
