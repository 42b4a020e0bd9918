import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

const STALE_MS = 30_000;
const MAX_RETRIES = 2;

/** One QueryClient for the app: low-rate data only (live samples never go through it). */
export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: STALE_MS,
        refetchOnWindowFocus: false,
        // A 4xx will not fix itself by asking again.
        retry: (count, error) => !(error instanceof ApiError && error.status < 500) && count < MAX_RETRIES,
      },
    },
  });
}
