import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DisplayLinkItem } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { adminKeys } from '@/features/facility-admin/api/admin-keys';

export interface NewDisplayLink extends DisplayLinkItem {
  /** Shown once: only its hash is kept on the server. */
  key: string;
  url: string;
}

export function createDisplayLink(name: string) {
  return api.post<NewDisplayLink>('/api/admin/display-links', { name });
}

export function useCreateDisplayLink() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createDisplayLink, onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.all }) });
}
