import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, resetCsrfToken } from '../../../lib/api-client';
import { getLiveSocket } from '../../../lib/live-socket';
import { ME_QUERY_KEY } from './get-me';

/** Ends the session on the server. */
export async function logout(): Promise<void> {
  await api('/api/auth/logout', { method: 'POST' });
  resetCsrfToken();
}

/** Mutation for the sign-out button; forgets every cached answer of the old session. */
export function useLogout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: logout,
    onSettled: () => {
      // The socket belonged to the old session; the next live screen opens a new one.
      getLiveSocket().close();
      queryClient.clear();
      queryClient.setQueryData(ME_QUERY_KEY, null);
    },
  });
}
