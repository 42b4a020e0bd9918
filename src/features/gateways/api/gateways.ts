import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { GatewayCreatedResponseSchema, GatewayListResponseSchema, GatewayResponseSchema } from '../../../../shared/schemas/gateway';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/queries/query-keys';

/** The board refreshes gateway state this often (it is low-rate: online, last seen, outbox depth). */
const GATEWAY_REFRESH_MS = 5000;

/** GET /api/gateways: every gateway with its live state, and whether MQTT is configured. */
export const gatewaysQueryOptions = () =>
  queryOptions({
    queryKey: queryKeys.gateways.all,
    queryFn: () => api('/api/gateways', { schema: GatewayListResponseSchema }),
    refetchInterval: GATEWAY_REFRESH_MS,
  });

/** The gateways, refreshed while shown. */
export function useGateways() {
  return useQuery(gatewaysQueryOptions());
}

function useGatewayMutation<A>(call: (arg: A) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: call,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: queryKeys.gateways.all }), queryClient.invalidateQueries({ queryKey: queryKeys.benches.all })]),
  });
}

/** POST /api/gateways (admin): the answer holds the password, shown once. */
export function useRegisterGateway() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (name: string) => api('/api/gateways', { method: 'POST', body: { name }, schema: GatewayCreatedResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.gateways.all }),
  });
}

/** POST /api/gateways/:id/revoke (admin). */
export const useRevokeGateway = () => useGatewayMutation((id: number) => api(`/api/gateways/${id}/revoke`, { method: 'POST', body: {}, schema: GatewayResponseSchema }));

/** PUT /api/gateways/:id/benches (admin): the benches it runs. */
export const useAssignBenches = () =>
  useGatewayMutation(({ id, benchIds }: { id: number; benchIds: number[] }) => api(`/api/gateways/${id}/benches`, { method: 'PUT', body: { benchIds }, schema: GatewayResponseSchema }));
