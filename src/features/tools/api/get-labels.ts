import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ToolLabel } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export function getLabels(areaId: number | null, options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: ToolLabel[] }>('/api/labels', { ...options, params: { areaId } });
}

export function labelsQueryOptions(areaId: number | null) {
  return queryOptions({ queryKey: toolKeys.labels(areaId), queryFn: ({ signal }) => getLabels(areaId, { signal }), staleTime: 5 * 60_000 });
}

export function useLabels(areaId: number | null) {
  return useQuery(labelsQueryOptions(areaId));
}
