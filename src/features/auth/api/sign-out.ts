import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';
import { closeSocket } from '@/lib/socket';
import { sessionKeys, type Session } from '@/features/auth/api/get-session';

export async function signOut(): Promise<void> {
  try {
    await api.del('/api/session');
  } catch (error) {
    // Already signed out on the server (expired, or ended elsewhere): the goal is reached.
    if (isApiError(error) && error.status === 401) return;
    throw error;
  }
}

/**
 * Ends the session, closes the socket and forgets every cached answer. With the user gone
 * from the session query the protected layout leaves for /sign-in by itself; the session is
 * then fetched again for a new CSRF token (the old one died with the session).
 */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      closeSocket();
      const signedOut: Session = { user: null, csrfToken: '' };
      queryClient.setQueryData(sessionKeys.current(), signedOut);
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== sessionKeys.all[0] });
      void queryClient.invalidateQueries({ queryKey: sessionKeys.all });
    },
  });
}
