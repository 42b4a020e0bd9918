import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { ReadingsResponseSchema } from '../../../../shared/schemas/api-runs';
import {
  CreateShareLinkResponseSchema, EmailShareLinkResponseSchema, ShareLinkMailsResponseSchema, ShareLinksResponseSchema, SharedReportSchema,
  type CreateShareLinkRequest, type EmailShareLinkRequest, type ShareTargetKind,
} from '../../../../shared/schemas/share';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** GET /api/share-links for one run or pack (technician). */
export function useShareLinks(kind: ShareTargetKind, targetId: number) {
  return useQuery({
    queryKey: queryKeys.shareLinks(kind, targetId),
    queryFn: () => api(`/api/share-links?kind=${kind}&targetId=${targetId}`, { schema: ShareLinksResponseSchema }).then((b) => b.links),
  });
}

/** POST /api/share-links: the answer holds the token, once. */
export function useCreateShareLink(kind: ShareTargetKind, targetId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: Omit<CreateShareLinkRequest, 'kind' | 'targetId'>) =>
      api('/api/share-links', { method: 'POST', body: { ...body, kind, targetId }, schema: CreateShareLinkResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.shareLinks(kind, targetId) }),
  });
}

/** POST /api/share-links/:id/email: queues the link in an e-mail to a client (the token proves the link was just made). */
export function useEmailShareLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ linkId, ...body }: EmailShareLinkRequest & { linkId: number }) =>
      api(`/api/share-links/${linkId}/email`, { method: 'POST', body, schema: EmailShareLinkResponseSchema }),
    onSuccess: (_answer, { linkId }) => queryClient.invalidateQueries({ queryKey: queryKeys.shareLinkMails(linkId) }),
  });
}

/** How long the list of a link's e-mails waits before asking again while one is still pending. */
const PENDING_MAIL_REFRESH_MS = 3000;

/** GET /api/share-links/:id/mails: the link's e-mails and whether each went out (asked again while one is pending). */
export function useShareLinkMails(linkId: number) {
  return useQuery({
    queryKey: queryKeys.shareLinkMails(linkId),
    queryFn: () => api(`/api/share-links/${linkId}/mails`, { schema: ShareLinkMailsResponseSchema }).then((b) => b.mails),
    refetchInterval: (query) => (query.state.data?.some((m) => m.status === 'pending') ? PENDING_MAIL_REFRESH_MS : false),
  });
}

/** POST /api/share-links/:id/revoke. */
export function useRevokeShareLink(kind: ShareTargetKind, targetId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (linkId: number) => api(`/api/share-links/${linkId}/revoke`, { method: 'POST', schema: z.unknown() }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.shareLinks(kind, targetId) }),
  });
}

/** GET /api/shared/:token: the shared report, no account needed. */
export function useSharedReport(token: string) {
  return useQuery({
    queryKey: queryKeys.shared(token),
    queryFn: () => api(`/api/shared/${token}`, { schema: z.object({ report: SharedReportSchema }) }).then((b) => b.report),
    retry: false,
  });
}

/** The shared run's chart data: min/max buckets through the token. */
export function useSharedReadings(token: string, span: { from: number | null; to: number | null }, maxPoints: number) {
  const range = span.from !== null && span.to !== null ? `&from=${span.from}&to=${span.to}` : '';
  return useQuery({
    queryKey: [...queryKeys.shared(token), 'readings', span.from, span.to, maxPoints],
    queryFn: () => api(`/api/shared/${token}/readings?maxPoints=${maxPoints}${range}`, { schema: ReadingsResponseSchema }),
    retry: false,
  });
}
