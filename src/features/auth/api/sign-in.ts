import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { signInInput, signInResponseSchema, type MeResponse, type SignInInput, type SignInResponse } from '@shared/schemas/auth';
import { api, setAccessToken } from '@/lib/api-client';
import { startSession } from '@/lib/auth';
import { getMe } from './get-me';

export { signInInput };

export function signIn(input: SignInInput): Promise<SignInResponse> {
  // auth: false — a 401 here means wrong credentials, not an expired session.
  return api.post('/auth/sign-in', { body: input, schema: signInResponseSchema, auth: false });
}

/** Shared by sign-in and accepting an invitation: both answer with a fresh session. */
export async function completeSignIn(queryClient: QueryClient, response: SignInResponse): Promise<MeResponse> {
  // /me needs the new token, and carries the permissions the sign-in answer does not.
  setAccessToken(response.accessToken);
  const me = await getMe();
  startSession(queryClient, response.accessToken, me);
  return me;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (input: SignInInput) => completeSignIn(queryClient, await signIn(input)),
  });
}
