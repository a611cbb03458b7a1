import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';
import type { PartView } from '@/features/maintenance/api/types';

export const getParts = (filters: { toolId?: number; q?: string }, options: { signal?: AbortSignal } = {}) => {
  const qs = new URLSearchParams();
  if (filters.toolId) qs.set('toolId', String(filters.toolId));
  if (filters.q) qs.set('q', filters.q);
  return api.get<{ items: PartView[]; total: number }>(`/api/parts?${qs}`, options);
};

export function useParts(filters: { toolId?: number; q?: string } = {}) {
  return useQuery({ queryKey: maintenanceKeys.parts(filters), queryFn: ({ signal }) => getParts(filters, { signal }) });
}

export interface PartInput {
  name: string;
  partNumber: string;
  stock: number;
  reorderLevel: number;
  toolIds: number[];
}

export function useSavePart() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: number; input: Partial<PartInput> }) =>
      id ? api.patch<PartView>(`/api/parts/${id}`, input) : api.post<PartView>('/api/parts', input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}
