import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TicketActionInput, TicketDetail } from '@shared/schemas/tickets';
import { api, isApiError } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export interface ActionResult {
  id: number;
  status: string;
  version: number;
}

export function postTicketAction(id: number, input: TicketActionInput): Promise<ActionResult> {
  return api.post<ActionResult>(`/api/tickets/${id}/actions`, input);
}

/** A 409 stale_version answer carries the ticket as it is now; read it from the raw body. */
export class StaleTicket extends Error {
  constructor(
    readonly current: TicketDetail,
    readonly attempted: TicketActionInput,
  ) {
    super('Someone else changed this ticket in the meantime.');
  }
}

async function postWithCurrent(id: number, input: TicketActionInput): Promise<ActionResult> {
  // The shared client drops unknown body fields of errors, so this one call reads the 409 itself.
  try {
    return await postTicketAction(id, input);
  } catch (error) {
    if (isApiError(error) && error.status === 409 && error.code === 'stale_version') {
      const current = await api.get<TicketDetail>(`/api/tickets/${id}`);
      throw new StaleTicket(current, input);
    }
    throw error;
  }
}

export function useTicketAction(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: TicketActionInput) => postWithCurrent(id, input),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ticketKeys.detail(id) });
      void queryClient.invalidateQueries({ queryKey: ticketKeys.lists() });
    },
  });
}
