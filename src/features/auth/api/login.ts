import { useMutation, useQueryClient } from '@tanstack/react-query';
import { LoginResponseSchema } from '../../../../shared/schemas/user';
import { api, resetCsrfToken } from '../../../lib/api-client';
import { ME_QUERY_KEY } from './get-me';

export interface LoginInput {
  email: string;
  password: string;
}

/** Signs in; the session is regenerated, so the old CSRF token is dropped. */
export async function login(input: LoginInput) {
  const body = await api('/api/auth/login', { method: 'POST', body: input, schema: LoginResponseSchema });
  resetCsrfToken();
  return body.user;
}

/** Mutation for the sign-in form; stores the user so the guard lets them in at once. */
export function useLogin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: login,
    onSuccess: (user) => queryClient.setQueryData(ME_QUERY_KEY, user),
  });
}
