import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { PlanView } from '@/features/maintenance/api/types';

export const getPlans = (toolId?: number, options: { signal?: AbortSignal } = {}) =>
  api.get<{ items: PlanView[]; total: number }>(`/api/maintenance/plans?limit=500${toolId ? `&toolId=${toolId}` : ''}`, options);

export function usePlans(toolId?: number) {
  return useQuery({ queryKey: maintenanceKeys.plans(toolId), queryFn: ({ signal }) => getPlans(toolId, { signal }) });
}
