import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ServiceTargetView } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function getServiceTargets(options: { signal?: AbortSignal } = {}): Promise<ServiceTargetView[]> {
  return api.get<ServiceTargetView[]>('/api/service-targets', options);
}

export function serviceTargetsQueryOptions() {
  return queryOptions({
    queryKey: ticketKeys.serviceTargets(),
    queryFn: ({ signal }) => getServiceTargets({ signal }),
    staleTime: 5 * 60_000,
  });
}

export function useServiceTargets() {
  return useQuery(serviceTargetsQueryOptions());
}
