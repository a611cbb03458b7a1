import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TicketDetail } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function getTicket(id: number, options: { signal?: AbortSignal } = {}): Promise<TicketDetail> {
  return api.get<TicketDetail>(`/api/tickets/${id}`, options);
}

export function ticketQueryOptions(id: number) {
  return queryOptions({
    queryKey: ticketKeys.detail(id),
    queryFn: ({ signal }) => getTicket(id, { signal }),
  });
}

export function useTicket(id: number) {
  return useQuery(ticketQueryOptions(id));
}
