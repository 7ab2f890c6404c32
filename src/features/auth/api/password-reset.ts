import { passwordResetConfirmSchema, passwordResetRequestSchema } from '@shared/schemas/auth.schema';
import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '@/lib/api-client';

export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>;
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>;

/** POST /api/auth/password-reset → 202, the same answer whether or not the address has an account. */
export function requestPasswordReset(body: PasswordResetRequest): Promise<void> {
  return api.post('/api/auth/password-reset', body, { skipAuthRedirect: true });
}

/** POST /api/auth/password-reset/confirm → 204, or 400 { error: { code: 'invalid_token' } }. */
export function confirmPasswordReset(body: PasswordResetConfirm): Promise<void> {
  return api.post('/api/auth/password-reset/confirm', body, { skipAuthRedirect: true });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}

export function useConfirmPasswordReset() {
  return useMutation({ mutationFn: confirmPasswordReset });
}
