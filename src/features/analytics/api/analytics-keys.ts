import type { AnalyticsQueryInput } from '@shared/schemas/analytics';

/** Query keys of the analytics feature, from general to specific. */
export const analyticsKeys = {
  all: ['analytics'] as const,
  reports: () => [...analyticsKeys.all, 'report'] as const,
  report: (params: AnalyticsParams) => [...analyticsKeys.reports(), params] as const,
  scopes: () => [...analyticsKeys.all, 'scopes'] as const,
  toolReliabilities: () => [...analyticsKeys.all, 'tool-reliability'] as const,
  toolReliability: (toolId: number) => [...analyticsKeys.toolReliabilities(), toolId] as const,
};

/** What the report API takes, as query-string values (ISO instants for the period). */
export interface AnalyticsParams {
  from: string;
  to: string;
  scope: NonNullable<AnalyticsQueryInput['scope']>;
  areaId?: number;
  toolId?: number;
}

/** The query string of a report request, shared by the JSON call and the CSV links. */
export function analyticsSearch(params: AnalyticsParams): string {
  const search = new URLSearchParams({ from: params.from, to: params.to, scope: params.scope });
  if (params.scope === 'area' && params.areaId) search.set('areaId', String(params.areaId));
  if (params.scope === 'tool' && params.toolId) search.set('toolId', String(params.toolId));
  return search.toString();
}
