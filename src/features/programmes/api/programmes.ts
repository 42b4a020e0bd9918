import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { ProgrammeSchema, type ProgrammeInput } from '../../../../shared/schemas/programme';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

const ListSchema = z.object({ programmes: z.array(ProgrammeSchema) });
const OneSchema = z.object({ programme: ProgrammeSchema });

/** GET /api/programmes: every saved programme. */
export function useProgrammes() {
  return useQuery({ queryKey: queryKeys.programmes.all, queryFn: () => api('/api/programmes', { schema: ListSchema }).then((b) => b.programmes) });
}

/** POST /api/programmes (new) or PUT /api/programmes/:id (change): the server refuses unsafe values with a message per field. */
export function useSaveProgramme() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number | null; input: ProgrammeInput }) =>
      api(id === null ? '/api/programmes' : `/api/programmes/${id}`, { method: id === null ? 'POST' : 'PUT', body: input, schema: OneSchema }).then((b) => b.programme),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.programmes.all }),
  });
}

/** DELETE /api/programmes/:id (runs that followed it keep their copy). */
export function useDeleteProgramme() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api(`/api/programmes/${id}`, { method: 'DELETE', schema: z.unknown() }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.programmes.all }),
  });
}
