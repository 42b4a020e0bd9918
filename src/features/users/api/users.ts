import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { PublicUserSchema, type CreateUserRequest, type UpdateUserRequest } from '../../../../shared/schemas/user';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

const USERS_KEY = queryKeys.users.all;

/** GET /api/users (admin). */
export function useUsers() {
  return useQuery({
    queryKey: USERS_KEY,
    queryFn: () => api('/api/users', { schema: z.object({ users: z.array(PublicUserSchema) }) }).then((b) => b.users),
  });
}

/** POST /api/users (admin): invite a colleague or a client. */
export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateUserRequest) => api('/api/users', { method: 'POST', body, schema: z.object({ user: PublicUserSchema }) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: USERS_KEY }),
  });
}

/** PATCH /api/users/:id (admin): role, name, disabled. */
export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, patch }: { id: number; patch: UpdateUserRequest }) =>
      api(`/api/users/${id}`, { method: 'PATCH', body: patch, schema: z.object({ user: PublicUserSchema }) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: USERS_KEY }),
  });
}
