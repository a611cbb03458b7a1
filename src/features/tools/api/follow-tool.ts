import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export function setFollowing(toolId: number, follow: boolean): Promise<{ following: boolean }> {
  return follow ? api.put(`/api/tools/${toolId}/follow`) : api.del(`/api/tools/${toolId}/follow`);
}

export function useFollowTool(toolId: number, code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (follow: boolean) => setFollowing(toolId, follow),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: toolKeys.detail(code) }),
        queryClient.invalidateQueries({ queryKey: toolKeys.following() }),
      ]),
  });
}
