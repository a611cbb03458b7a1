import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminArea } from '@/features/facility-admin/api/admin-keys';

export function getAdminAreas(includeRetired: boolean, options: { signal?: AbortSignal } = {}) {
  return api.get<{ items: AdminArea[]; total: number }>('/api/admin/areas', { ...options, params: { includeRetired, limit: 200 } });
}

export function adminAreasQueryOptions(includeRetired: boolean) {
  return queryOptions({ queryKey: adminKeys.areas(includeRetired), queryFn: ({ signal }) => getAdminAreas(includeRetired, { signal }) });
}

export function useAdminAreas(includeRetired = false) {
  return useQuery(adminAreasQueryOptions(includeRetired));
}
