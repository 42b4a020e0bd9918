import type { QueryClient } from '@tanstack/react-query';
import { SettingsForm } from '../../features/settings/components/settings-form';
import { PageHeader } from '../../components/ui/card';
import { labSettingsQueryOptions } from '../../lib/lab-settings';
import { RequireRole } from '../require-auth';

/** Lab settings (admin). */
export function Component() {
  return (
    <RequireRole min="admin">
      <PageHeader title="Lab settings" subtitle="Defaults for every run and every screen in the lab." />
      <SettingsForm />
    </RequireRole>
  );
}

/** The settings being edited. */
export function prefetch(queryClient: QueryClient): void {
  void queryClient.prefetchQuery(labSettingsQueryOptions());
}
