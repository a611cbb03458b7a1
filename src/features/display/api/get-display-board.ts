import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BoardData } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { displayKeys } from '@/features/display/api/display-keys';

export function getDisplayBoard(key: string, options: { signal?: AbortSignal } = {}) {
  return api.get<BoardData>('/api/board', { ...options, headers: { 'X-Display-Key': key } });
}

export function displayBoardQueryOptions(key: string, enabled: boolean) {
  return queryOptions({
    queryKey: displayKeys.board(key),
    queryFn: ({ signal }) => getDisplayBoard(key, { signal }),
    enabled,
    // The socket brings changes at once; a slow poll covers a network that drops silently.
    refetchInterval: 2 * 60_000,
    refetchIntervalInBackground: true,
    staleTime: 10_000,
  });
}

export function useDisplayBoard(key: string, enabled: boolean) {
  return useQuery(displayBoardQueryOptions(key, enabled));
}
