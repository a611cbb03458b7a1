import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminToolDetail } from '@/features/facility-admin/api/admin-keys';

export function getAdminTool(id: number, options: { signal?: AbortSignal } = {}) {
  return api.get<AdminToolDetail>(`/api/admin/tools/${id}`, options);
}

export function adminToolQueryOptions(id: number) {
  return queryOptions({ queryKey: adminKeys.tool(id), queryFn: ({ signal }) => getAdminTool(id, { signal }) });
}

export function useAdminTool(id: number | null) {
  return useQuery({ ...adminToolQueryOptions(id ?? 0), enabled: id !== null });
}
