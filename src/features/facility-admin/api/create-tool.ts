import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ToolCreateInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys, type AdminToolDetail } from '@/features/facility-admin/api/admin-keys';

export function createTool(input: ToolCreateInput) {
  return api.post<AdminToolDetail>('/api/admin/tools', input);
}

export function useCreateTool() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createTool, onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }) });
}
