import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SignInLinkRequestInput } from '@shared/schemas/session';
import { api } from '@/lib/api-client';
import { sessionKeys, type Session } from '@/features/auth/api/get-session';

/** Asks for a sign-in link by e-mail; the answer is the same whether or not the address has an account. */
export function requestSignInLink(input: SignInLinkRequestInput): Promise<{ message: string }> {
  return api.post<{ message: string }>('/api/sign-in-links', input);
}

export function useRequestSignInLink() {
  return useMutation({ mutationFn: requestSignInLink });
}

/** Uses a mailed sign-in link (once); signs in like a password would. */
export function useSignInLink(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<Session>(`/api/sign-in-links/${encodeURIComponent(token)}`),
    onSuccess: (session) => {
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== sessionKeys.all[0] });
      queryClient.setQueryData(sessionKeys.current(), session);
    },
  });
}
