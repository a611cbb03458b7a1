import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ToolUpdateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminToolDetail } from '@/features/facility-admin/api/admin-keys';

export function updateTool(id: number, input: ToolUpdateInput) {
  return api.patch<AdminToolDetail>(`/api/admin/tools/${id}`, input);
}

export function useUpdateTool() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: ToolUpdateInput }) => updateTool(id, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }),
  });
}
