import { useMutation, useQueryClient } from '@tanstack/react-query';
import { acceptInvitationInput, signInResponseSchema, type AcceptInvitationInput, type SignInResponse } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { completeSignIn } from './sign-in';

export { acceptInvitationInput };

export function acceptInvitation(input: AcceptInvitationInput): Promise<SignInResponse> {
  return api.post('/auth/invitations/accept', { body: input, schema: signInResponseSchema, auth: false });
}

/** Accepting signs the new person in straight away. */
export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (input: AcceptInvitationInput) => completeSignIn(queryClient, await acceptInvitation(input)),
  });
}
