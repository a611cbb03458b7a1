import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { FeedView } from '@/features/maintenance/api/types';

export function useFeeds() {
  return useQuery({
    queryKey: maintenanceKeys.feeds(),
    queryFn: ({ signal }) => api.get<{ items: FeedView[] }>('/api/calendar-feeds', { signal }),
  });
}

export function useCreateFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { scope: FeedView['scope']; scopeId: number | null; label?: string | null }) =>
      api.post<FeedView>('/api/calendar-feeds', input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.feeds() }),
  });
}

export function useRevokeFeed() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.del(`/api/calendar-feeds/${id}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.feeds() }),
  });
}
