import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { HistoryEntry, Page } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export function getToolHistory(toolId: number, page: { limit: number; offset: number }, options: { signal?: AbortSignal } = {}) {
  return api.get<Page<HistoryEntry>>(`/api/tools/${toolId}/history`, { ...options, params: page });
}

export function toolHistoryQueryOptions(toolId: number, page: { limit: number; offset: number }) {
  return queryOptions({
    queryKey: toolKeys.history(toolId, page),
    queryFn: ({ signal }) => getToolHistory(toolId, page, { signal }),
    // Paging keeps the old page on screen until the next one arrives, so nothing jumps.
    placeholderData: keepPreviousData,
  });
}

export function useToolHistory(toolId: number, page: { limit: number; offset: number }) {
  return useQuery(toolHistoryQueryOptions(toolId, page));
}
