import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { sessionKeys } from '@/features/auth/api/get-session';

export interface ResetPasswordInput {
  /** The token from the e-mailed link (a reset or an invitation). */
  token: string;
  password: string;
}

export function resetPassword({ token, password }: ResetPasswordInput): Promise<{ message: string }> {
  return api.post<{ message: string }>(`/api/password-resets/${encodeURIComponent(token)}`, { password });
}

export function useResetPassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resetPassword,
    // The server ends every session of that account, perhaps this browser's own.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionKeys.all }),
  });
}
