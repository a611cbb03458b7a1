import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ModuleCreateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminModule } from '@/features/facility-admin/api/admin-keys';

export function createModule(toolId: number, input: ModuleCreateInput) {
  return api.post<AdminModule>(`/api/admin/tools/${toolId}/modules`, input);
}

export function useCreateModule() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ toolId, input }: { toolId: number; input: ModuleCreateInput }) => createModule(toolId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }),
  });
}
