import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PlanCreateInput } from '@shared/schemas/maintenance';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { PlanView } from '@/features/maintenance/api/types';

type PlanBody = Omit<PlanCreateInput, 'lastDoneAt' | 'leadDays' | 'leadUnits' | 'graceFactor'> & {
  leadDays?: number;
  leadUnits?: number;
  graceFactor?: number;
  lastDoneAt?: string;
};

/** Finds the tool by its code (the one printed on its label), then creates the plan. */
export async function createPlan(toolCode: string, body: Omit<PlanBody, 'toolId'>): Promise<PlanView> {
  const found = await api.get<{ items: { id: number }[] }>(
    `/api/report-tools?code=${encodeURIComponent(toolCode.trim().toUpperCase())}&limit=1`,
  );
  return api.post<PlanView>('/api/maintenance/plans', { toolId: found.items[0]?.id ?? 0, ...body });
}

export function useCreatePlan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ toolCode, body }: { toolCode: string; body: Omit<PlanBody, 'toolId'> }) => createPlan(toolCode, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}
