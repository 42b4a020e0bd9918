import { useMe } from '../../features/auth/api/get-me';
import { UsersPage } from '../../features/users/components/users-page';
import { RequireRole } from '../require-auth';

/** User management (admin). */
export function Component() {
  const me = useMe();
  return (
    <RequireRole min="admin">
      <UsersPage currentUserId={me.data?.id ?? 0} />
    </RequireRole>
  );
}
