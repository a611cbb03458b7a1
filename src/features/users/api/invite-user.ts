import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteUserInput } from '@shared/schemas/users';
import { api } from '@/lib/api-client';
import type { AdminUser } from '@/features/users/api/list-users';
import { userKeys } from '@/features/users/api/user-keys';

/** Creates the account without a password; the server e-mails a link to choose one. */
export function inviteUser(input: InviteUserInput): Promise<AdminUser> {
  return api.post<AdminUser>('/api/users', input);
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userKeys.lists() }),
  });
}
