import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ToolKeyView } from '@shared/schemas/alarms';
import { api } from '@/lib/api-client';
import { alarmKeys } from '@/features/alarms/api/alarm-keys';

export function useToolKeys(code: string) {
  return useQuery({
    queryKey: alarmKeys.toolKeys(code),
    queryFn: ({ signal }) => api.get<{ items: ToolKeyView[] }>(`/api/tools/${encodeURIComponent(code)}/keys`, { signal }),
  });
}

export function useCreateToolKey(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (label: string) => api.post<ToolKeyView & { key: string }>(`/api/tools/${encodeURIComponent(code)}/keys`, { label }),
    onSuccess: () => qc.invalidateQueries({ queryKey: alarmKeys.toolKeys(code) }),
  });
}

export function useRevokeToolKey(code: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.post<ToolKeyView>(`/api/tool-keys/${id}/revoke`),
    onSuccess: () => qc.invalidateQueries({ queryKey: alarmKeys.toolKeys(code) }),
  });
}
