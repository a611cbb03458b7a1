import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StaffPerson } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function getAssignees(options: { signal?: AbortSignal } = {}): Promise<StaffPerson[]> {
  return api.get<StaffPerson[]>('/api/assignees', { ...options, params: { limit: 100 } });
}

export function assigneesQueryOptions() {
  return queryOptions({ queryKey: ticketKeys.assignees(), queryFn: ({ signal }) => getAssignees({ signal }), staleTime: 10 * 60_000 });
}

export function useAssignees(enabled: boolean) {
  return useQuery({ ...assigneesQueryOptions(), enabled });
}
