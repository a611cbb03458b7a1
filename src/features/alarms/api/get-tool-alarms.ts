import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ToolAlarmsView } from '@shared/schemas/alarms';
import { api } from '@/lib/api-client';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';

export type ToolAlarms = ToolAlarmsView & { chatteringAlarms: string[] };

export function getToolAlarms(code: string, options: { signal?: AbortSignal } = {}): Promise<ToolAlarms> {
  return api.get<ToolAlarms>(`/api/tools/${encodeURIComponent(code)}/alarms?days=30&limit=50`, options);
}

export function toolAlarmsQueryOptions(code: string) {
  return queryOptions({ queryKey: alarmKeys.tool(code), queryFn: ({ signal }) => getToolAlarms(code, { signal }) });
}

export function useToolAlarms(code: string) {
  return useQuery(toolAlarmsQueryOptions(code));
}
