import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';

export interface AlarmLoadFigures {
  toolId: number | null;
  toolCode: string | null;
  toolName: string | null;
  count: number;
  perDay: number;
  per10Min: number;
  floodPct: number;
  floodPeriods: number;
  periods: number;
  chattering: number;
  stale: number;
  topTenSharePct: number;
}

export interface AlarmLoad {
  from: string;
  to: string;
  facility: AlarmLoadFigures;
  tools: AlarmLoadFigures[];
  topTen: { toolCode: string; alarmId: string; text: string; count: number; sharePct: number }[];
  targets: {
    acceptablePerDay: number;
    manageablePerDay: number;
    floodPctMax: number;
    chatteringMax: number;
    staleMax: number;
    topTenSharePctMax: number;
  };
}

export function getAlarmLoad(params: { from?: string; to?: string }, options: { signal?: AbortSignal } = {}): Promise<AlarmLoad> {
  const q = new URLSearchParams(Object.entries(params).filter((e): e is [string, string] => typeof e[1] === 'string'));
  return api.get<AlarmLoad>(`/api/analytics/alarm-load${q.size ? `?${q}` : ''}`, options);
}

export function alarmLoadQueryOptions(params: { from?: string; to?: string }) {
  return queryOptions({ queryKey: alarmKeys.load(params), queryFn: ({ signal }) => getAlarmLoad(params, { signal }) });
}

export function useAlarmLoad(params: { from?: string; to?: string }) {
  return useQuery(alarmLoadQueryOptions(params));
}
