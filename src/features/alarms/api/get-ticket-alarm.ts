import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TicketAlarmView } from '@shared/schemas/alarms';
import { api } from '@/lib/api-client';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';

export function getTicketAlarm(id: number, options: { signal?: AbortSignal } = {}): Promise<{ alarm: TicketAlarmView | null }> {
  return api.get<{ alarm: TicketAlarmView | null }>(`/api/tickets/${id}/alarm`, options);
}

export function ticketAlarmQueryOptions(id: number) {
  return queryOptions({ queryKey: alarmKeys.ticket(id), queryFn: ({ signal }) => getTicketAlarm(id, { signal }) });
}

export function useTicketAlarm(id: number, enabled: boolean) {
  return useQuery({ ...ticketAlarmQueryOptions(id), enabled });
}
