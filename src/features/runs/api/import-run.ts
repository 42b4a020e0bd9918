import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ImportResponseSchema } from '../../../../shared/schemas/api-runs';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

export interface ImportRunInput {
  file: File;
  name: string;
  batteryId?: number;
  endVolts?: number;
  currentSign: 'discharge-positive' | 'discharge-negative' | 'auto';
  tags?: string;
  /** Header names in the file, for columns Kneepoint does not recognise by itself. */
  columns?: { time?: string; volts?: string; amps?: string; temp?: string };
}

/** POST /api/runs/import (technician): a CSV log from another logger becomes a run. */
export function importRun(input: ImportRunInput) {
  const form = new FormData();
  form.set('file', input.file);
  form.set('name', input.name);
  form.set('currentSign', input.currentSign);
  if (input.batteryId !== undefined) form.set('batteryId', String(input.batteryId));
  if (input.endVolts !== undefined) form.set('endVolts', String(input.endVolts));
  if (input.tags) form.set('tags', input.tags);
  if (input.columns && Object.keys(input.columns).length > 0) form.set('columns', JSON.stringify(input.columns));
  return api('/api/runs/import', { method: 'POST', body: form, schema: ImportResponseSchema });
}

/** Mutation for the import form. */
export function useImportRun() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: importRun, onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.all }) });
}
