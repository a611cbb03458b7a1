import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ScopeOptions } from '@shared/schemas/analytics';
import { api } from '@/lib/api-client';
import { analyticsKeys } from '@/features/analytics/api/analytics-keys';

export function getScopes(options: { signal?: AbortSignal } = {}): Promise<ScopeOptions> {
  return api.get<ScopeOptions>('/api/analytics/scopes', options);
}

export function scopesQueryOptions() {
  return queryOptions({ queryKey: analyticsKeys.scopes(), queryFn: ({ signal }) => getScopes({ signal }), staleTime: 10 * 60_000 });
}

export function useScopes() {
  return useQuery(scopesQueryOptions());
}
