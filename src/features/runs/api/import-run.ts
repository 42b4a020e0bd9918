import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { ImportProgressSchema, ImportResponseSchema, type ImportProgress, type ImportTimeFormat } from '../../../../shared/schemas/api-runs';
import { api, ApiError } from '../../../lib/api-client';
import { postFormWithProgress } from '../../../lib/post-form-with-progress';
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
  /** How the time column is written; omitted: from the header or the values. */
  timeFormat?: ImportTimeFormat;
  /** Unit of a temperature column whose header names none; omitted: the lab's. */
  tempUnit?: 'C' | 'F' | 'K';
  acceptancePercent?: number;
  /** Lead-acid: initial electrolyte temperature, °C. */
  electrolyteTempCelsius?: number;
  /** A longer step is a gap; omitted: judged against the file's cadence. */
  maxGapSeconds?: number;
}

/** Files from this size on show their upload and processing progress (smaller ones finish before a bar would mean anything). */
export const LARGE_IMPORT_BYTES = 256 * 1024;
/** How often the form asks the server how far a large import has got. */
export const IMPORT_PROGRESS_POLL_MS = 400;
const HTTP_NOT_FOUND = 404;

/** What the form shows of a large import: the share uploaded, then the server's rows done. */
export interface ImportRunProgress {
  uploadedFraction: number;
  server: ImportProgress | null;
}

/** GET /api/runs/import/progress/:progressId: null while the server has not begun (or has answered). */
export async function getImportProgress(progressId: string): Promise<ImportProgress | null> {
  try {
    return await api(`/api/runs/import/progress/${encodeURIComponent(progressId)}`, { schema: ImportProgressSchema });
  } catch (err) {
    if (err instanceof ApiError && err.status === HTTP_NOT_FOUND) return null;
    throw err;
  }
}

/** A fresh name for one import's progress (a UUID where the browser has one). */
function newProgressId(): string {
  return typeof crypto !== 'undefined' && 'randomUUID' in crypto ? crypto.randomUUID() : `import-${Date.now().toString(36)}-${Math.random().toString(36).slice(2)}`;
}

/**
 * POST /api/runs/import (technician): a CSV log from another logger becomes a run. A large
 * file goes with upload progress (XMLHttpRequest) and, once uploaded, the server's progress
 * is polled until the answer comes; `onProgress` hears both.
 */
export async function importRun(input: ImportRunInput, onProgress?: (progress: ImportRunProgress) => void) {
  const form = new FormData();
  form.set('name', input.name);
  form.set('currentSign', input.currentSign);
  if (input.batteryId !== undefined) form.set('batteryId', String(input.batteryId));
  if (input.endVolts !== undefined) form.set('endVolts', String(input.endVolts));
  if (input.tags) form.set('tags', input.tags);
  for (const key of ['timeFormat', 'tempUnit', 'acceptancePercent', 'electrolyteTempCelsius', 'maxGapSeconds'] as const) {
    const value = input[key];
    if (value !== undefined) form.set(key, String(value));
  }
  if (input.columns && Object.keys(input.columns).length > 0) form.set('columns', JSON.stringify(input.columns));
  if (!onProgress || input.file.size < LARGE_IMPORT_BYTES) {
    form.set('file', input.file);
    return api('/api/runs/import', { method: 'POST', body: form, schema: ImportResponseSchema });
  }
  const progressId = newProgressId();
  // Fields before the file: the server reads them as they arrive.
  form.set('progressId', progressId);
  form.set('file', input.file);
  let latest: ImportRunProgress = { uploadedFraction: 0, server: null };
  const tell = (next: ImportRunProgress) => {
    latest = next;
    onProgress(next);
  };
  tell(latest);
  let answered = false;
  let timer: ReturnType<typeof setTimeout> | undefined;
  const poll = async () => {
    const server = await getImportProgress(progressId).catch(() => null);
    if (answered) return;
    if (server) tell({ uploadedFraction: 1, server });
    timer = setTimeout(() => void poll(), IMPORT_PROGRESS_POLL_MS);
  };
  try {
    return await postFormWithProgress('/api/runs/import', form, ImportResponseSchema, (fraction) => {
      tell({ ...latest, uploadedFraction: fraction });
      if (fraction >= 1 && timer === undefined) timer = setTimeout(() => void poll(), IMPORT_PROGRESS_POLL_MS);
    });
  } finally {
    answered = true;
    if (timer !== undefined) clearTimeout(timer);
  }
}

/** Mutation for the import form, with the progress of a large file (null otherwise and when done). */
export function useImportRun() {
  const queryClient = useQueryClient();
  const [progress, setProgress] = useState<ImportRunProgress | null>(null);
  const mutation = useMutation({
    mutationFn: (input: ImportRunInput) => importRun(input, setProgress),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.runs.all }),
    onSettled: () => setProgress(null),
  });
  return { ...mutation, progress };
}
