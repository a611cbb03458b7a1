import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { displayKeys } from '@/features/display/api/display-keys';

export interface DisplayLinkInfo {
  id: number;
  name: string;
}

/** The display checks its own key: a revoked key answers 401 display_revoked. */
export function getDisplayLink(key: string, options: { signal?: AbortSignal } = {}) {
  return api.get<DisplayLinkInfo>('/api/display-link', { ...options, headers: { 'X-Display-Key': key } });
}

export function displayLinkQueryOptions(key: string) {
  return queryOptions({
    queryKey: displayKeys.link(key),
    queryFn: ({ signal }) => getDisplayLink(key, { signal }),
    // A wall screen runs for weeks: re-check now and then that it may still show the board.
    refetchInterval: 5 * 60_000,
    staleTime: 60_000,
  });
}

export function useDisplayLink(key: string) {
  return useQuery(displayLinkQueryOptions(key));
}
