import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';

export function clearAlarm(id: number): Promise<{ id: number; clearedAt: string }> {
  return api.post<{ id: number; clearedAt: string }>(`/api/alarm-occurrences/${id}/clear`);
}

export function useClearAlarm() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: clearAlarm, onSuccess: () => qc.invalidateQueries({ queryKey: alarmKeys.all }) });
}
