import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SignInInput } from '@shared/schemas/session';
import { api } from '@/lib/api-client';
import { sessionKeys, type Session } from '@/features/auth/api/get-session';

export function signIn(input: SignInInput): Promise<Session> {
  return api.post<Session>('/api/session', input);
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      // Nothing cached for whoever used this browser before may show through.
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== sessionKeys.all[0] });
      // The session id (and with it the CSRF token) changed at sign-in.
      queryClient.setQueryData(sessionKeys.current(), session);
    },
  });
}
