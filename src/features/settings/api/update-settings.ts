import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { LabSettingsSchema, type LabSettings } from '../../../../shared/schemas/lab-settings';
import { api } from '../../../lib/api-client';
import { LAB_SETTINGS_QUERY_KEY } from '../../../lib/lab-settings';

/** PUT /api/settings (admin): the whole settings document. */
export function useUpdateSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (settings: LabSettings) =>
      api('/api/settings', { method: 'PUT', body: settings, schema: z.object({ settings: LabSettingsSchema }) }).then((b) => b.settings),
    onSuccess: (settings) => queryClient.setQueryData(LAB_SETTINGS_QUERY_KEY, settings),
  });
}
