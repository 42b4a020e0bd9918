import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { BenchInstrumentsSchema } from '../../../../shared/schemas/bench-instruments';
import type { InstrumentDriverInput } from '../../../../shared/schemas/instrument-driver';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

const AnswerSchema = z.object({ instruments: BenchInstrumentsSchema });
const key = (benchId: number) => [...queryKeys.benches.detail(benchId), 'instruments'] as const;

/** GET /api/benches/:id/instruments: the bench's load and supply driver settings. */
export function useBenchInstruments(benchId: number) {
  return useQuery({ queryKey: key(benchId), queryFn: () => api(`/api/benches/${benchId}/instruments`, { schema: AnswerSchema }).then((b) => b.instruments) });
}

/** PUT /api/benches/:id/instruments (admin). */
export function useSaveBenchInstruments(benchId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { load: InstrumentDriverInput | null; supply: InstrumentDriverInput | null }) =>
      api(`/api/benches/${benchId}/instruments`, { method: 'PUT', body, schema: AnswerSchema }).then((b) => b.instruments),
    onSuccess: (saved) => queryClient.setQueryData(key(benchId), saved),
  });
}
