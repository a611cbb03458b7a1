import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ToolDetail } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export function getTool(code: string, options: { signal?: AbortSignal } = {}): Promise<ToolDetail> {
  return api.get<ToolDetail>(`/api/tools/by-code/${encodeURIComponent(code)}`, options);
}

export function toolQueryOptions(code: string) {
  return queryOptions({ queryKey: toolKeys.detail(code), queryFn: ({ signal }) => getTool(code, { signal }) });
}

export function useTool(code: string) {
  return useQuery(toolQueryOptions(code));
}
