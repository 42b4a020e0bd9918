import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface ChangePasswordInput {
  currentPassword: string;
  newPassword: string;
}

/** Changes the signed-in user's own password. */
export function changePassword(input: ChangePasswordInput): Promise<unknown> {
  return api('/api/auth/password', { method: 'POST', body: input });
}

/** Mutation for the change-password form. */
export function useChangePassword() {
  return useMutation({ mutationFn: changePassword });
}
