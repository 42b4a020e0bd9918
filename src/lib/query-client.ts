import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';
import { ME_QUERY_KEY } from './session';

const HTTP_UNAUTHORIZED = 401;

const STALE_MS = 30_000;
const MAX_RETRIES = 2;

/** One QueryClient for the app: low-rate data only (live readings never go through it). */
export function createQueryClient(): QueryClient {
  // A 401 anywhere means the session ended (expired, signed out elsewhere): forget the user,
  // and the route guard sends the person to sign-in instead of showing broken pages.
  const onError = (error: unknown) => {
    if (error instanceof ApiError && error.status === HTTP_UNAUTHORIZED) client.setQueryData(ME_QUERY_KEY, null);
  };
  const client: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError }),
    mutationCache: new MutationCache({ onError }),
    defaultOptions: {
      queries: {
        staleTime: STALE_MS,
        refetchOnWindowFocus: false,
        // A 4xx will not fix itself by asking again.
        retry: (count, error) => !(error instanceof ApiError && error.status < 500) && count < MAX_RETRIES,
      },
    },
  });
  return client;
}
