import { useMe } from '../../features/auth/api/get-me';
import { ChangePasswordForm } from '../../features/auth/components/change-password-form';
import { Card, PageHeader } from '../../components/ui/card';

/** The signed-in user's own page: who they are and a password change. */
export function Component() {
  const me = useMe();
  return (
    <>
      <PageHeader title="My account" subtitle={me.data ? `${me.data.name} · ${me.data.email} · ${me.data.role}` : undefined} />
      <Card>
        <h2 className="mb-4 text-lg font-semibold">Change password</h2>
        <ChangePasswordForm />
      </Card>
    </>
  );
}
