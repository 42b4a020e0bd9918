/** Query key of the signed-in user; the auth feature fills it, the query client clears it on a 401. */
export const ME_QUERY_KEY = ['auth', 'me'] as const;
