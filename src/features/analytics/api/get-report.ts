import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AnalyticsReport } from '@shared/schemas/analytics';
import { api } from '@/lib/api-client';
import { analyticsKeys, analyticsSearch, type AnalyticsParams } from '@/features/analytics/api/analytics-keys';

export function getReport(params: AnalyticsParams, options: { signal?: AbortSignal } = {}): Promise<AnalyticsReport> {
  return api.get<AnalyticsReport>(`/api/analytics?${analyticsSearch(params)}`, options);
}

export function reportQueryOptions(params: AnalyticsParams | null) {
  return queryOptions({
    queryKey: analyticsKeys.report(params ?? { from: '', to: '', scope: 'facility' }),
    queryFn: ({ signal }) => getReport(params!, { signal }),
    enabled: params !== null,
    // The figures of a past period do not change; the current one moves slowly.
    staleTime: 5 * 60_000,
    // Keep the last report on screen while a new period or scope loads.
    placeholderData: keepPreviousData,
  });
}

export function useReport(params: AnalyticsParams | null) {
  return useQuery(reportQueryOptions(params));
}

/** Links for the CSV downloads: plain GETs, so the browser saves the attachment itself. */
export function csvUrl(kind: 'tools' | 'months', params: AnalyticsParams): string {
  return `/api/analytics/${kind}.csv?${analyticsSearch(params)}`;
}
