import { BenchSetupPage } from '../../features/benches/components/bench-setup-page';
import { RequireRole } from '../require-auth';

/** Add a bench (admin). */
export function Component() {
  return (
    <RequireRole min="admin">
      <BenchSetupPage benchId={null} />
    </RequireRole>
  );
}
