import { useMe } from '../../features/auth/api/get-me';
import { ProgrammesPage } from '../../features/programmes/components/programmes-page';
import { hasRole } from '../../lib/roles';

/** Saved test programmes (technicians edit). */
export function Component() {
  const me = useMe();
  return <ProgrammesPage canEdit={hasRole(me.data?.role, 'technician')} />;
}
