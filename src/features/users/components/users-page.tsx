import { useState } from 'react';
import { RoleSchema } from '../../../../shared/schemas/user';
import { Button } from '../../../components/ui/button';
import { Card, PageHeader } from '../../../components/ui/card';
import { Loading, QueryError } from '../../../components/ui/status';
import { useUpdateUser, useUsers } from '../api/users';
import { ROLE_OPTIONS } from './role-options';
import { UserForm } from './user-form';

/** Lab manager's page: who may sign in and with which role. */
export function UsersPage({ currentUserId }: { currentUserId: number }) {
  const users = useUsers();
  const update = useUpdateUser();
  const [adding, setAdding] = useState(false);
  return (
    <>
      <PageHeader
        title="Users"
        subtitle="Technicians, clients and lab managers of this lab."
        actions={!adding ? <Button onClick={() => setAdding(true)}>Create user</Button> : undefined}
      />
      {adding && (
        <Card className="mb-6 p-6">
          <UserForm onDone={() => setAdding(false)} />
        </Card>
      )}
      {update.isError && (
        <p role="alert" className="mb-4 text-sm text-state-cutoff">
          {update.error instanceof Error ? update.error.message : 'The change was not saved.'}
        </p>
      )}
      {users.isPending ? (
        <Loading />
      ) : users.isError ? (
        <QueryError error={users.error} what="Users" />
      ) : (
        <div className="overflow-x-auto rounded-xl border border-line">
          <table className="w-full text-left text-sm">
            <thead className="bg-surface-sunken text-ink-muted">
              <tr>
                <th className="px-3 py-3">Name</th>
                <th className="px-3 py-3">E-mail</th>
                <th className="px-3 py-3">Role</th>
                <th className="px-3 py-3">Access</th>
              </tr>
            </thead>
            <tbody>
              {users.data.map((u) => (
                <tr key={u.id} className="border-t border-line bg-surface-raised">
                  <td className="px-3 py-3 font-semibold">{u.name}</td>
                  <td className="px-3 py-3">{u.email}</td>
                  <td className="px-3 py-3">
                    <select
                      aria-label={`Role of ${u.name}`}
                      value={u.role}
                      disabled={u.id === currentUserId || update.isPending}
                      onChange={(e) => update.mutate({ id: u.id, patch: { role: RoleSchema.parse(e.target.value) } })}
                      className="min-h-11 rounded-lg border border-line bg-surface-sunken px-2 text-ink"
                    >
                      {ROLE_OPTIONS.map((o) => (
                        <option key={o.value} value={o.value}>
                          {o.label}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="px-3 py-3">
                    <Button
                      variant="secondary"
                      disabled={u.id === currentUserId || update.isPending}
                      onClick={() => update.mutate({ id: u.id, patch: { disabled: !u.disabled } })}
                    >
                      {u.disabled ? 'Enable' : 'Disable'}
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
