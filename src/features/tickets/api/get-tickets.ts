import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { TicketList, TicketListQuery } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function getTickets(filters: TicketListQuery, options: { signal?: AbortSignal } = {}): Promise<TicketList> {
  return api.get<TicketList>('/api/tickets', { ...options, params: { ...filters } });
}

export function ticketsQueryOptions(filters: TicketListQuery) {
  return queryOptions({
    queryKey: ticketKeys.list(filters),
    queryFn: ({ signal }) => getTickets(filters, { signal }),
    placeholderData: keepPreviousData,
  });
}

export function useTickets(filters: TicketListQuery) {
  return useQuery(ticketsQueryOptions(filters));
}
