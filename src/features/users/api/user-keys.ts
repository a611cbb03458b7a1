import type { Role } from '@shared/roles';

export interface UserListFilters {
  /** Part of a name or an e-mail address. */
  q?: string;
  role?: Role;
  limit: number;
  offset: number;
}

// There is no single-user endpoint; every screen reads people through the list.
export const userKeys = {
  all: ['users'] as const,
  lists: () => [...userKeys.all, 'list'] as const,
  list: (filters: UserListFilters) => [...userKeys.lists(), filters] as const,
};
