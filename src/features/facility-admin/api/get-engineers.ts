import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys, type Engineer } from '@/features/facility-admin/api/admin-keys';

export function getEngineers(options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: Engineer[]; total: number }>('/api/admin/engineers', { ...options, params: { limit: 200 } });
}

export function engineersQueryOptions() {
  return queryOptions({ queryKey: adminKeys.engineers(), queryFn: ({ signal }) => getEngineers({ signal }), staleTime: 5 * 60_000 });
}

export function useEngineers() {
  return useQuery(engineersQueryOptions());
}
