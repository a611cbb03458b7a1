import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { WorkOrder, WorkOrderDetail } from '@/features/maintenance/api/types';

// The steps of a work order (book, start, record progress, complete, skip, use a part): one
// mutation hook, since they share the refresh that follows each.

export type WorkOrderStep =
  | { step: 'window'; body: { version: number; startsAt: string; endsAt: string } }
  | { step: 'start'; body: { version: number } }
  | {
      step: 'progress';
      body: {
        version: number;
        results?: { step: number; done: boolean; value: number | null }[];
        handsOnMinutes?: number | null;
        notes?: string | null;
      };
    }
  | { step: 'complete'; body: { version: number; overrideReason?: string } }
  | { step: 'skip'; body: { version: number; reason: string } }
  | { step: 'part'; body: { partId: number | null; freeText: string | null; quantity: number } };

export function sendWorkOrderStep(id: number, s: WorkOrderStep): Promise<WorkOrder> {
  switch (s.step) {
    case 'window':
      return api.put(`/api/work-orders/${id}/window`, s.body);
    case 'progress':
      return api.patch(`/api/work-orders/${id}`, s.body);
    case 'part':
      return api.post(`/api/work-orders/${id}/parts`, s.body);
    default:
      return api.post(`/api/work-orders/${id}/${s.step}`, s.body);
  }
}

export function useWorkOrderStep(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (s: WorkOrderStep) => sendWorkOrderStep(id, s),
    // The answer carries the new version: the next step must not wait for the refetch.
    onSuccess: (answer, s) => {
      if (s.step === 'part') return;
      queryClient.setQueryData<WorkOrderDetail>(maintenanceKeys.workOrder(id), (old) => (old ? { ...old, workOrder: answer } : old));
    },
    onSettled: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}
