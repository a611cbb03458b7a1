import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { noticeKeys } from '@/features/notices/api/notice-keys';

export function markNoticeRead(id: number) {
  return api.post(`/api/notices/${id}/read`);
}

export function markAllNoticesRead() {
  return api.post<{ marked: number }>('/api/notices/read-all');
}

export function useMarkNoticeRead() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: markNoticeRead, onSuccess: () => queryClient.invalidateQueries({ queryKey: noticeKeys.all }) });
}

export function useMarkAllNoticesRead() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: markAllNoticesRead, onSuccess: () => queryClient.invalidateQueries({ queryKey: noticeKeys.all }) });
}
