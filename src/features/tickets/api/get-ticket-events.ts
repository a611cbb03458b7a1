import { useInfiniteQuery } from '@tanstack/react-query';
import type { TicketEventPage } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function getTicketEvents(id: number, before: number, options: { signal?: AbortSignal } = {}): Promise<TicketEventPage> {
  return api.get<TicketEventPage>(`/api/tickets/${id}/events`, { ...options, params: { before } });
}

/**
 * The events before the first one a long ticket page shows, a page at a time, loaded only
 * once asked for (`enabled`); each page ends where the previous one starts.
 */
export function useOlderTicketEvents(id: number, firstShownId: number, enabled: boolean) {
  return useInfiniteQuery({
    queryKey: ticketKeys.olderEvents(id, firstShownId),
    queryFn: ({ pageParam, signal }) => getTicketEvents(id, pageParam, { signal }),
    initialPageParam: firstShownId,
    getNextPageParam: (last) => (last.olderEvents > 0 && last.events.length > 0 ? last.events[0].id : undefined),
    enabled,
  });
}
