import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { NoticePage } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { noticeKeys } from '@/features/notices/api/notice-keys';

export function getNotices(page: { limit: number; offset: number }, options: { signal?: AbortSignal } = {}) {
  return api.get<NoticePage>('/api/notices', { ...options, params: page });
}

export function noticesQueryOptions(page: { limit: number; offset: number }) {
  return queryOptions({
    queryKey: noticeKeys.list(page),
    queryFn: ({ signal }) => getNotices(page, { signal }),
    placeholderData: keepPreviousData,
  });
}

export function useNotices(page: { limit: number; offset: number }) {
  return useQuery(noticesQueryOptions(page));
}
