import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserInput } from '@shared/schemas/users';
import { api } from '@/lib/api-client';
import type { AdminUser } from '@/features/users/api/list-users';
import { userKeys } from '@/features/users/api/user-keys';

export interface UpdateUserVariables {
  id: number;
  /** Only what changes: the server signs a person out whenever `role` is sent, even unchanged. */
  changes: UpdateUserInput;
}

export function updateUser({ id, changes }: UpdateUserVariables): Promise<AdminUser> {
  return api.patch<AdminUser>(`/api/users/${id}`, changes);
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userKeys.lists() }),
  });
}
