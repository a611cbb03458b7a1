import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AreaUpdateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminArea } from '@/features/facility-admin/api/admin-keys';

export function updateArea(id: number, input: AreaUpdateInput) {
  return api.patch<AdminArea>(`/api/admin/areas/${id}`, input);
}

export function useUpdateArea() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: AreaUpdateInput }) => updateArea(id, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }),
  });
}
