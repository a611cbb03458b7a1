import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { Overview } from '@/features/maintenance/api/types';

export const getOverview = (options: { signal?: AbortSignal } = {}) => api.get<Overview>('/api/maintenance', options);

export function useOverview() {
  return useQuery(queryOptions({ queryKey: maintenanceKeys.overview(), queryFn: ({ signal }) => getOverview({ signal }) }));
}
