import { BenchSetupPage } from '../../features/benches/components/bench-setup-page';
import { BenchInstrumentsForm } from '../../features/programmes/components/bench-instruments-form';
import { RequireRole } from '../require-auth';
import { useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';

export { prefetch } from './bench';

/** Change a bench and its source (admin). */
export function Component() {
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  return (
    <RequireRole min="admin">
      <BenchSetupPage key={benchId} benchId={benchId} />
      <BenchInstrumentsForm key={`instruments-${benchId}`} benchId={benchId} />
    </RequireRole>
  );
}
