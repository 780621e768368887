import { useMutation } from '@tanstack/react-query';
import { resetPasswordInput, type ResetPasswordInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export { resetPasswordInput };

export async function resetPassword(input: ResetPasswordInput): Promise<void> {
  await api.post('/auth/reset-password', { body: input, auth: false });
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
