import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ToolChoice } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { reportKeys } from '@/features/report/api/report-keys';

export function getToolChoices(
  q: { code?: string; q?: string; id?: number },
  options: { signal?: AbortSignal } = {},
): Promise<{ items: ToolChoice[] }> {
  return api.get<{ items: ToolChoice[] }>('/api/report-tools', { ...options, params: { ...q, limit: 20 } });
}

export function toolChoicesQueryOptions(q: { code?: string; q?: string; id?: number }) {
  return queryOptions({
    queryKey: reportKeys.toolChoices(q),
    queryFn: ({ signal }) => getToolChoices(q, { signal }),
    staleTime: 5 * 60_000,
    placeholderData: keepPreviousData,
  });
}

export function useToolChoices(q: { code?: string; q?: string; id?: number }, enabled = true) {
  return useQuery({ ...toolChoicesQueryOptions(q), enabled });
}
