import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { WorkOrderDetail } from '@/features/maintenance/api/types';

export const getWorkOrder = (id: number, options: { signal?: AbortSignal } = {}) =>
  api.get<WorkOrderDetail>(`/api/work-orders/${id}`, options);

export function useWorkOrder(id: number) {
  return useQuery({ queryKey: maintenanceKeys.workOrder(id), queryFn: ({ signal }) => getWorkOrder(id, { signal }) });
}
