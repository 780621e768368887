import { useMutation } from '@tanstack/react-query';
import { forgotPasswordInput, type ForgotPasswordInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export { forgotPasswordInput };

/** Answers 202 whether or not the address has an account, so nobody can probe for accounts. */
export async function forgotPassword(input: ForgotPasswordInput): Promise<void> {
  await api.post('/auth/forgot-password', { body: input, auth: false });
}

export function useForgotPassword() {
  return useMutation({ mutationFn: forgotPassword });
}
