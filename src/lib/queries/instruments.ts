import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { InstrumentSchema } from '../../../shared/schemas/instrument';
import { api } from '../api-client';
import { queryKeys } from './query-keys';

const ListSchema = z.object({ instruments: z.array(InstrumentSchema) });

/** GET /api/instruments (every record) or ?benchId= (those on one bench: the records page and the bench's calibration flag). */
export const instrumentsQueryOptions = (benchId: number | null = null) =>
  queryOptions({
    queryKey: queryKeys.instruments.list(benchId),
    queryFn: () => api(benchId === null ? '/api/instruments' : `/api/instruments?benchId=${benchId}`, { schema: ListSchema }).then((b) => b.instruments),
  });
