import type { TicketListQuery } from '@shared/schemas/tickets';

/**
 * Every ticket query key starts with 'tickets', and every list of tickets (queue, my
 * reports, a tool's tickets, the report form's open tickets) sits under lists(): one socket
 * event then refreshes whichever of them is on screen.
 */
export const ticketKeys = {
  all: ['tickets'] as const,
  lists: () => [...ticketKeys.all, 'list'] as const,
  list: (filters: TicketListQuery) => [...ticketKeys.lists(), filters] as const,
  details: () => [...ticketKeys.all, 'detail'] as const,
  detail: (id: number) => [...ticketKeys.details(), id] as const,
  /** Under the ticket's detail key, so whatever refreshes the ticket refreshes these too. */
  olderEvents: (id: number, firstShownId: number) => [...ticketKeys.detail(id), 'older-events', firstShownId] as const,
  serviceTargets: () => [...ticketKeys.all, 'service-targets'] as const,
  assignees: () => [...ticketKeys.all, 'assignees'] as const,
};
