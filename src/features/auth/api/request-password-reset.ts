import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { passwordResetRequestSchema } from '@shared/schemas/password';
import { api } from '@/lib/api-client';

export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>;

/** The server answers 202 whether or not the address has an account, so nobody can probe for accounts. */
export function requestPasswordReset(input: PasswordResetRequestInput): Promise<{ message: string }> {
  return api.post<{ message: string }>('/api/password-resets', input);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
