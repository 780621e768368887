import { useMutation } from '@tanstack/react-query';
import { changePasswordInput, type ChangePasswordInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export { changePasswordInput };

export async function changePassword(input: ChangePasswordInput): Promise<void> {
  await api.post('/auth/password', { body: input });
}

export function useChangePassword() {
  return useMutation({ mutationFn: changePassword });
}
