import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { InstrumentSchema, type InstrumentInput } from '../../../../shared/schemas/instrument';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

const OneSchema = z.object({ instrument: InstrumentSchema });

/** POST /api/instruments or PUT /api/instruments/:id (admin). */
export function useSaveInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number | null; input: InstrumentInput }) =>
      api(id === null ? '/api/instruments' : `/api/instruments/${id}`, { method: id === null ? 'POST' : 'PUT', body: input, schema: OneSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.instruments.all }),
  });
}

/** DELETE /api/instruments/:id (admin). */
export function useDeleteInstrument() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api(`/api/instruments/${id}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.instruments.all }),
  });
}

/** POST /api/instruments/:id/certificate (admin): the calibration certificate (PDF, PNG or JPEG). */
export function useUploadCertificate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, file }: { id: number; file: File }) => {
      const form = new FormData();
      form.append('file', file, file.name);
      return api(`/api/instruments/${id}/certificate`, { method: 'POST', body: form, schema: OneSchema });
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.instruments.all }),
  });
}
