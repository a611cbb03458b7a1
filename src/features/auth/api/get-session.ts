import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Role } from '@shared/roles';
import { api } from '@/lib/api-client';

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

export interface Session {
  user: SessionUser | null;
  /** Sent back in X-CSRF-Token on every request that changes something. */
  csrfToken: string;
}

export const sessionKeys = {
  all: ['session'] as const,
  current: () => [...sessionKeys.all, 'current'] as const,
};

export function getSession(options: { signal?: AbortSignal } = {}): Promise<Session> {
  return api.get<Session>('/api/session', options);
}

export function sessionQueryOptions() {
  return queryOptions({
    queryKey: sessionKeys.current(),
    queryFn: ({ signal }) => getSession({ signal }),
    // The session changes only through sign-in, sign-out or a 401, each of which updates
    // or invalidates this query; a focus refetch still notices a session that expired.
    staleTime: 5 * 60_000,
  });
}

export function useSession() {
  return useQuery(sessionQueryOptions());
}
