import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CommentInput } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function addComment(id: number, input: CommentInput): Promise<{ id: number; eventId: number }> {
  return api.post(`/api/tickets/${id}/comments`, input);
}

export function useAddComment(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CommentInput) => addComment(id, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ticketKeys.detail(id) }),
  });
}
