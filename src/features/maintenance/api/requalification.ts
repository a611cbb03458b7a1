import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { RequalRecordView, ToolRequal } from '@/features/maintenance/api/types';

export const getToolRequal = (toolId: number, options: { signal?: AbortSignal } = {}) =>
  api.get<ToolRequal[]>(`/api/tools/${toolId}/requalification`, options);

export function useToolRequal(toolId: number) {
  return useQuery({ queryKey: maintenanceKeys.requal(toolId), queryFn: ({ signal }) => getToolRequal(toolId, { signal }) });
}

export interface RecordInput {
  values?: number[];
  pasted?: string;
  workOrderId?: number | null;
  ticketId?: number | null;
}

export function useCreateRecord(templateId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RecordInput) => api.post<RequalRecordView>(`/api/requal-templates/${templateId}/records`, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}
