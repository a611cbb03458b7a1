import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DisplayLinkItem } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys } from '@/features/facility-admin/api/admin-keys';

export function revokeDisplayLink(id: number) {
  return api.del<DisplayLinkItem>(`/api/admin/display-links/${id}`);
}

export function useRevokeDisplayLink() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeDisplayLink, onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }) });
}
