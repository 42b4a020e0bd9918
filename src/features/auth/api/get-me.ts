import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { PublicUserSchema, type PublicUser } from '../../../../shared/schemas/user';
import { api, ApiError } from '../../../lib/api-client';
import { ME_QUERY_KEY } from '../../../lib/session';

const HTTP_UNAUTHORIZED = 401;

// `session` answers { user } with null when signed out.
const SessionResponseSchema = z.object({ user: PublicUserSchema.nullable() });

/** Who is signed in, or null when nobody is (GET /api/auth/session; a 401 still means nobody). */
export async function getMe(): Promise<PublicUser | null> {
  try {
    const body = await api('/api/auth/session', { schema: SessionResponseSchema });
    return body.user;
  } catch (error) {
    if (error instanceof ApiError && error.status === HTTP_UNAUTHORIZED) return null;
    throw error;
  }
}

export { ME_QUERY_KEY };

/** Query options for the current user; shared by the guard, the layout and the sign-in page. */
export const meQueryOptions = () => queryOptions({ queryKey: ME_QUERY_KEY, queryFn: getMe, staleTime: Infinity });

/** The current user (undefined while loading, null when signed out). */
export function useMe() {
  return useQuery(meQueryOptions());
}
