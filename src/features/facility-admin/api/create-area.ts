import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AreaCreateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminArea } from '@/features/facility-admin/api/admin-keys';

export function createArea(input: AreaCreateInput) {
  return api.post<AdminArea>('/api/admin/areas', input);
}

export function useCreateArea() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createArea, onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }) });
}
