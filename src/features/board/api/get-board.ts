import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BoardData } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';

// The board is one query for the whole facility: search and filters work on it in the
// browser, so typing never waits for the network and a live change updates every view.
export const boardKeys = {
  all: ['board'] as const,
  current: () => [...boardKeys.all, 'current'] as const,
};

export function getBoard(options: { signal?: AbortSignal } = {}): Promise<BoardData> {
  return api.get<BoardData>('/api/board', options);
}

export function boardQueryOptions() {
  return queryOptions({
    queryKey: boardKeys.current(),
    queryFn: ({ signal }) => getBoard({ signal }),
    // The socket announces every change; this only covers a socket that silently died.
    refetchInterval: 5 * 60_000,
  });
}

export function useBoard() {
  return useQuery(boardQueryOptions());
}
