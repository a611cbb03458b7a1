import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminToolRow } from '@/features/facility-admin/api/admin-keys';

export const ADMIN_TOOLS_PAGE = 25;

export interface AdminToolFilters {
  q: string;
  areaId: number | null;
  includeRetired: boolean;
  offset: number;
}

export function getAdminTools(f: AdminToolFilters, options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: AdminToolRow[]; total: number }>('/api/admin/tools', {
    ...options,
    params: { q: f.q || undefined, areaId: f.areaId, includeRetired: f.includeRetired, limit: ADMIN_TOOLS_PAGE, offset: f.offset },
  });
}

export function adminToolsQueryOptions(f: AdminToolFilters) {
  return queryOptions({
    queryKey: adminKeys.toolList(f),
    queryFn: ({ signal }) => getAdminTools(f, { signal }),
    placeholderData: keepPreviousData,
  });
}

export function useAdminTools(f: AdminToolFilters) {
  return useQuery(adminToolsQueryOptions(f));
}
