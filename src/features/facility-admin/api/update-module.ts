import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ModuleUpdateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminModule } from '@/features/facility-admin/api/admin-keys';

export function updateModule(id: number, input: ModuleUpdateInput) {
  return api.patch<AdminModule>(`/api/admin/modules/${id}`, input);
}

export function useUpdateModule() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: ModuleUpdateInput }) => updateModule(id, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }),
  });
}
