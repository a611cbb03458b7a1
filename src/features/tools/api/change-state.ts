import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BoardTool, StateChangeInput } from '@shared/schemas/facility';
import { api } from '@/lib/api-client';
import { toolKeys } from '@/features/tools/api/tool-keys';

export interface StateChangeAnswer {
  interval: { id: number; moduleId: number | null; state: string; previousState: string | null; startedAt: string };
  tool: BoardTool;
}

export function changeToolState(toolId: number, input: StateChangeInput): Promise<StateChangeAnswer> {
  return api.post<StateChangeAnswer>(`/api/tools/${toolId}/state`, input);
}

export function useChangeToolState(toolId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StateChangeInput) => changeToolState(toolId, input),
    // The socket tells every other screen; this one refreshes at once.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: toolKeys.all }),
  });
}
