import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { PlanView } from '@/features/maintenance/api/types';

export interface PlanChanges {
  version: number;
  title?: string;
  everyDays?: number | null;
  everyUnits?: number | null;
  leadDays?: number;
  graceFactor?: number;
  estimatedMinutes?: number;
  active?: boolean;
}

/** Saves changes to a plan; the server records each one (from → to, who, when). */
export function useUpdatePlan(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (changes: PlanChanges) => api.patch<PlanView>(`/api/maintenance/plans/${id}`, changes),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}
