import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TicketList } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { reportKeys } from '@/features/report/api/report-keys';

/** Open tickets on one tool: what the reporter may be about to report again. */
export function getOpenTickets(toolId: number, options: { signal?: AbortSignal } = {}): Promise<TicketList> {
  return api.get<TicketList>('/api/tickets', { ...options, params: { toolId, status: 'open', sort: 'newest', limit: 20 } });
}

export function openTicketsQueryOptions(toolId: number) {
  return queryOptions({ queryKey: reportKeys.openTickets(toolId), queryFn: ({ signal }) => getOpenTickets(toolId, { signal }) });
}

export function useOpenTickets(toolId: number | null) {
  return useQuery({ ...openTicketsQueryOptions(toolId ?? 0), enabled: toolId !== null });
}
