import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BoardData } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';

export interface FilterOptions {
  areas: { id: number; name: string; tools: { id: number; code: string; name: string }[] }[];
}

export const queueKeys = {
  all: ['queue'] as const,
  filterOptions: () => [...queueKeys.all, 'filter-options'] as const,
};

/** Areas and tools for the queue's filters, taken from the board (the one list of every tool). */
export async function getFilterOptions(options: { signal?: AbortSignal } = {}): Promise<FilterOptions> {
  const board = await api.get<BoardData>('/api/board', options);
  return {
    areas: board.areas.map((a) => ({ id: a.id, name: a.name, tools: a.tools.map((t) => ({ id: t.id, code: t.code, name: t.name })) })),
  };
}

export function filterOptionsQueryOptions() {
  return queryOptions({
    queryKey: queueKeys.filterOptions(),
    queryFn: ({ signal }) => getFilterOptions({ signal }),
    staleTime: 10 * 60_000,
  });
}

export function useFilterOptions() {
  return useQuery(filterOptionsQueryOptions());
}
