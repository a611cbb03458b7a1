import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BoardTool } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export function getFollowedTools(options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: BoardTool[] }>('/api/me/following', options);
}

export function followedToolsQueryOptions() {
  return queryOptions({ queryKey: toolKeys.following(), queryFn: ({ signal }) => getFollowedTools({ signal }) });
}

export function useFollowedTools() {
  return useQuery(followedToolsQueryOptions());
}
