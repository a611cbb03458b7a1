import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ToolReliability } from '@shared/schemas/analytics';
import { api } from '@/lib/api-client';
import { analyticsKeys } from '@/features/analytics/api/analytics-keys';

export function getToolReliability(toolId: number, options: { signal?: AbortSignal } = {}): Promise<ToolReliability> {
  return api.get<ToolReliability>(`/api/analytics/tools/${toolId}/reliability`, options);
}

export function toolReliabilityQueryOptions(toolId: number) {
  return queryOptions({
    queryKey: analyticsKeys.toolReliability(toolId),
    queryFn: ({ signal }) => getToolReliability(toolId, { signal }),
    staleTime: 60_000,
  });
}

export function useToolReliability(toolId: number) {
  return useQuery(toolReliabilityQueryOptions(toolId));
}
