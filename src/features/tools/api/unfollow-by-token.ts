import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export interface UnfollowAnswer {
  tool: { id: number; code: string; name: string } | null;
}

/** The e-mail's unfollow link: works without signing in, once. */
export function unfollowByToken(token: string): Promise<UnfollowAnswer> {
  return api.post<UnfollowAnswer>('/api/unfollow', { token });
}

export function useUnfollowByToken() {
  return useMutation({ mutationFn: unfollowByToken });
}
