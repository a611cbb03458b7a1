import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DisplayLinkItem } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys } from '@/features/facility-admin/api/admin-keys';

export function getDisplayLinks(includeRevoked: boolean, options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: DisplayLinkItem[]; total: number }>('/api/admin/display-links', {
    ...options,
    params: { includeRevoked, limit: 200 },
  });
}

export function displayLinksQueryOptions(includeRevoked: boolean) {
  return queryOptions({
    queryKey: adminKeys.displayLinks(includeRevoked),
    queryFn: ({ signal }) => getDisplayLinks(includeRevoked, { signal }),
  });
}

export function useDisplayLinks(includeRevoked: boolean) {
  return useQuery(displayLinksQueryOptions(includeRevoked));
}
