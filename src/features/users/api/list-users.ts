import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Role } from '@shared/roles';
import type { UserAction } from '@shared/schemas/users';
import { api } from '@/lib/api-client';
import { userKeys, type UserListFilters } from '@/features/users/api/user-keys';

/** A person as the admin API presents them. */
export interface AdminUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  onCall: boolean;
  /** Invited and has not chosen a password yet. */
  invited: boolean;
  lastSignInAt: string | null;
  createdAt: string;
  /** What the signed-in admin may do to this account (server/modules/users/user.policy.ts). */
  allowedActions: UserAction[];
}

export interface UserList {
  items: AdminUser[];
  total: number;
}

export function listUsers(filters: UserListFilters, options: { signal?: AbortSignal } = {}): Promise<UserList> {
  return api.get<UserList>('/api/users', {
    signal: options.signal,
    params: { q: filters.q || undefined, role: filters.role, limit: filters.limit, offset: filters.offset },
  });
}

export function usersQueryOptions(filters: UserListFilters) {
  return queryOptions({
    queryKey: userKeys.list(filters),
    queryFn: ({ signal }) => listUsers(filters, { signal }),
    // Typing in the search box or paging keeps the last rows in view until the next arrive.
    placeholderData: keepPreviousData,
  });
}

export function useUsers(filters: UserListFilters) {
  return useQuery(usersQueryOptions(filters));
}
