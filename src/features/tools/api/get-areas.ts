import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export interface AreaSummary {
  id: number;
  name: string;
  code: string;
}

export function getAreas(options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: AreaSummary[]; total: number }>('/api/areas', options);
}

export function areasQueryOptions() {
  return queryOptions({
    queryKey: [...toolKeys.all, 'areas'] as const,
    queryFn: ({ signal }) => getAreas({ signal }),
    staleTime: 5 * 60_000,
  });
}

export function useAreas() {
  return useQuery(areasQueryOptions());
}
