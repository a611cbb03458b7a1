import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useNavigate } from 'react-router';
import { api } from '@/lib/api-client';
import { maintenanceKeys } from '@/features/maintenance/api/maintenance-keys';

export interface TicketPartUse {
  id: number;
  partId: number | null;
  name: string | null;
  partNumber: string | null;
  freeText: string | null;
  quantity: number;
}

const key = (ticketId: number) => [...maintenanceKeys.all, 'ticket-parts', ticketId] as const;

export function useTicketParts(ticketId: number) {
  return useQuery({
    queryKey: key(ticketId),
    queryFn: ({ signal }) => api.get<TicketPartUse[]>(`/api/tickets/${ticketId}/parts`, { signal }),
  });
}

export function useUseTicketPart(ticketId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { partId: number | null; freeText: string | null; quantity: number }) =>
      api.post(`/api/tickets/${ticketId}/parts`, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: maintenanceKeys.all }),
  });
}

/** "Make a work order from this ticket", then open it. */
export function useWorkOrderFromTicket(ticketId: number) {
  const navigate = useNavigate();
  return useMutation({
    mutationFn: () => api.post<{ id: number }>(`/api/tickets/${ticketId}/work-order`, {}),
    onSuccess: (wo) => navigate(`/maintenance/work-orders/${wo.id}`),
  });
}
