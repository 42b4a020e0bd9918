import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { CommandLogRowSchema, RunProgrammeSchema, type ProgrammeControlAction } from '../../../../shared/schemas/programme-run';
import { api, ApiError } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

const OneSchema = z.object({ programme: RunProgrammeSchema });
const HTTP_NOT_FOUND = 404;
/** How often a running programme's progress is fetched again, ms (the step clock ticks locally in between). */
export const PROGRAMME_REFRESH_MS = 2000;

/** GET /api/runs/:id/programme: the programme a run follows (null when none), refreshed while it runs. */
export function useRunProgramme(runId: number) {
  return useQuery({
    queryKey: queryKeys.runs.programme(runId),
    queryFn: () =>
      api(`/api/runs/${runId}/programme`, { schema: OneSchema }).then(
        (b) => b.programme,
        (error: unknown) => (error instanceof ApiError && error.status === HTTP_NOT_FOUND ? null : Promise.reject(error)),
      ),
    refetchInterval: (query) => (['starting', 'running', 'paused'].includes(query.state.data?.state ?? '') ? PROGRAMME_REFRESH_MS : false),
  });
}

/** POST /api/runs/:id/programme: start a saved programme; the cautions must be acknowledged. */
export function useStartProgramme(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (programmeId: number) => api(`/api/runs/${runId}/programme`, { method: 'POST', body: { programmeId, acknowledgeCautions: true }, schema: OneSchema }),
    onSuccess: (body) => queryClient.setQueryData(queryKeys.runs.programme(runId), body.programme),
  });
}

/** POST /api/runs/:id/programme/control: pause, resume, skip or abort the current step. */
export function useProgrammeControl(runId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (action: ProgrammeControlAction) => api(`/api/runs/${runId}/programme/control`, { method: 'POST', body: { action }, schema: OneSchema }),
    onSuccess: (body) => queryClient.setQueryData(queryKeys.runs.programme(runId), body.programme),
  });
}

/** GET /api/runs/:id/command-log: every command sent to the run's instruments and the reply. */
export function useCommandLog(runId: number, enabled: boolean) {
  return useQuery({
    queryKey: queryKeys.runs.commandLog(runId),
    queryFn: () => api(`/api/runs/${runId}/command-log`, { schema: z.object({ commands: z.array(CommandLogRowSchema.extend({ id: z.number() })) }) }).then((b) => b.commands),
    enabled,
  });
}
