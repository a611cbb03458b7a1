import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Priority } from '@shared/priority';
import type { ServiceTargetInput, ServiceTargetView } from '@shared/schemas/tickets';
import { api } from '@/lib/api-client';
import { ticketKeys } from '@/features/tickets/api/ticket-keys';

export function updateServiceTarget(priority: Priority, input: ServiceTargetInput): Promise<ServiceTargetView> {
  return api.put<ServiceTargetView>(`/api/service-targets/${priority}`, input);
}

export function useUpdateServiceTarget() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ priority, input }: { priority: Priority; input: ServiceTargetInput }) => updateServiceTarget(priority, input),
    // Every timer on every list depends on the targets.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ticketKeys.all }),
  });
}
